import { describe, expect, it } from 'vitest';

import {
  autonomyDays,
  batteryForAutonomyKwh,
  dailyPvWh,
  heatBudget,
  heaterEnergy,
  heaterEnergyFromMinutes,
  heaterPowerW,
} from './energy';
import { kWhToBtu } from './units';

describe('heater energy', () => {
  const every = (
    n: number,
    stepS: number,
    f: (i: number) => { on: boolean; currentA: number | null; volts: number | null },
  ) => Array.from({ length: n }, (_, i) => ({ tMs: i * stepS * 1000, ...f(i) }));

  it('power of a resistive load: P = V·I single-phase, P = √3·V_LL·I balanced three-phase (IEC 60050-131; Hughes, Electrical and Electronic Technology, three-phase power)', () => {
    expect(heaterPowerW(230, 10, 1)).toBe(2300);
    // worked example: a balanced resistive load on a 400 V three-phase supply drawing 10 A per line takes 6.93 kW
    expect(heaterPowerW(400, 10, 3)).toBeCloseTo(6928.2, 1);
  });

  it('integrates measured power by the trapezoid rule: a current rising evenly 0 → 10 A over an hour at 230 V is 1.15 kWh (the exact integral, 230 V × 5 A × 1 h)', () => {
    const e = heaterEnergy(
      every(361, 10, (i) => ({ on: true, currentA: i / 36, volts: 230 })),
      { ratedKw: 3, phases: 1 },
      { intervalS: 10 },
    );
    expect(e.measuredKwh).toBeCloseTo(1.15, 9);
    expect(e).toMatchObject({ estimatedKwh: 0, basis: 'measured', gaps: 0 });
    expect(e.coveredHours).toBeCloseTo(1, 9);
  });

  it('a dead element (0 A while switched on) is ~0 kWh measured, where nameplate × time on would claim 15 kWh', () => {
    const dead = every(361, 10, () => ({ on: true, currentA: 0, volts: 400 }));
    const e = heaterEnergy(dead, { ratedKw: 15, phases: 3 }, { intervalS: 10 });
    expect(e.kwh).toBe(0);
    expect(e.basis).toBe('measured');
    expect(e.onHours).toBeCloseTo(1, 9);
    // the same hour without a current sensor: the estimate, labelled as such
    const unmeasured = heaterEnergy(
      dead.map((x) => ({ ...x, currentA: null })),
      { ratedKw: 15, phases: 3 },
      { intervalS: 10 },
    );
    expect(unmeasured).toMatchObject({ measuredKwh: 0, basis: 'estimated' });
    expect(unmeasured.estimatedKwh).toBeCloseTo(15, 9);
  });

  it('leaves out a stretch longer than three reporting intervals and counts it', () => {
    // 10 s reports at 230 V and 20 A (4.6 kW), with five minutes missing in the middle of an hour
    const s = every(361, 10, () => ({ on: true, currentA: 20, volts: 230 })).filter(
      (x) => x.tMs < 1_200_000 || x.tMs >= 1_500_000,
    );
    const e = heaterEnergy(s, { ratedKw: null, phases: 1 }, { intervalS: 10 });
    expect(e.gaps).toBe(1);
    expect(e.gapHours).toBeCloseTo(310 / 3600, 9);
    expect(e.kwh).toBeCloseTo((4.6 * (3600 - 310)) / 3600, 9);
  });

  it('minute rollups give the same kWh as the samples for evenly spaced readings', () => {
    // an hour of 10 s readings at 240 V, the heater drawing 12.5 A for the first 40 minutes and 0 A after
    const s = every(360, 10, (i) => ({ on: i < 240, currentA: i < 240 ? 12.5 : 0, volts: 240 }));
    const minutes = Array.from({ length: 60 }, (_, m) => {
      const rows = s.slice(m * 6, m * 6 + 6);
      return {
        minuteMs: m * 60_000,
        n: 6,
        onN: rows.filter((r) => r.on).length,
        viSum: rows.reduce((a, r) => a + r.volts! * r.currentA!, 0),
        viN: 6,
      };
    });
    const fromMinutes = heaterEnergyFromMinutes(minutes, { ratedKw: 3, phases: 1 });
    // 3 kW for 40 minutes is 2 kWh; the samples' trapezoid ends at the last reading and counts half an interval less at the switch-off
    expect(fromMinutes.kwh).toBeCloseTo(2, 9);
    const fromSamples = heaterEnergy(
      [...s, { tMs: 3_600_000, on: false, currentA: 0, volts: 240 }],
      { ratedKw: 3, phases: 1 },
      { intervalS: 10 },
    );
    expect(fromSamples.kwh).toBeCloseTo(2 - 3 * (5 / 3600), 9);
    expect(
      heaterEnergyFromMinutes([...minutes.slice(0, 10), ...minutes.slice(20)], { ratedKw: 3, phases: 1 }),
    ).toMatchObject({ gaps: 1 });
  });

  it('1 kWh is 3412 Btu (International Table Btu)', () => {
    expect(kWhToBtu(1)).toBeCloseTo(3412.14, 2);
  });
});

describe('off-grid budget (Sandia SAND87-7023 relations)', () => {
  it('array output is rating × peak sun hours × derating', () => {
    expect(dailyPvWh({ pvArrayW: 2000, peakSunHours: 1.5, derating: 0.8 })).toBeCloseTo(2400, 9);
  });

  it('autonomy is usable battery over daily load, and sizing inverts it', () => {
    expect(autonomyDays(20, 0.5, 2000)).toBeCloseTo(5, 9);
    expect(batteryForAutonomyKwh(2000, 5, 0.5)).toBeCloseTo(20, 9);
  });

  it('answers how long a site can heat through a storm', () => {
    const site = {
      batteryKwh: 60,
      depthOfDischarge: 0.6,
      stateOfCharge: 0.9,
      baseLoadW: 200,
      pvArrayW: 3000,
      peakSunHours: 1,
      derating: 0.75,
    };
    // usable now: (0.9 − 0.4) × 60 kWh = 30 kWh; 800 W heater + 200 W load = 1 kW net → 30 h.
    const b = heatBudget(site, 800, 24);
    expect(b.usableNowWh).toBeCloseTo(30_000, 6);
    expect(b.hoursOfHeating).toBeCloseTo(30, 9);
    expect(b.canHeatThroughStorm).toBe(true);
    expect(heatBudget(site, 800, 36).canHeatThroughStorm).toBe(false);
    // a sunny spell can keep up with a small load
    expect(heatBudget({ ...site, pvArrayW: 100_000 }, 800, 36, 1).hoursOfHeating).toBe(Infinity);
  });

  it('a battery already at its allowed depth cannot heat at all', () => {
    const b = heatBudget(
      {
        batteryKwh: 10,
        depthOfDischarge: 0.5,
        stateOfCharge: 0.4,
        baseLoadW: 50,
        pvArrayW: 0,
        peakSunHours: 0,
        derating: 1,
      },
      500,
      1,
    );
    expect(b.usableNowWh).toBe(0);
    expect(b.hoursOfHeating).toBe(0);
  });
});
