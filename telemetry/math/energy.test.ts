import { describe, expect, it } from 'vitest';
import { autonomyDays, batteryForAutonomyKwh, dailyPvWh, heatBudget, heaterEnergyKwh, seasonEnergyKwh } from './energy';
import { kWhToBtu } from './units';

const h = 3_600_000;

describe('heater energy', () => {
  it('is kW × hours on (common practice)', () => {
    const samples = [{ tMs: 0, on: true }, { tMs: 2 * h, on: false }, { tMs: 3 * h, on: true }];
    expect(heaterEnergyKwh(samples, 12, 4.5 * h)).toBeCloseTo(12 * 3.5, 9);
  });

  it('a season adds an after-run to each icing episode (common practice)', () => {
    expect(seasonEnergyKwh(10, 100, 12, 30)).toBe(10 * (100 + 6));
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
    const site = { batteryKwh: 60, depthOfDischarge: 0.6, stateOfCharge: 0.9, baseLoadW: 200, pvArrayW: 3000, peakSunHours: 1, derating: 0.75 };
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
    const b = heatBudget({ batteryKwh: 10, depthOfDischarge: 0.5, stateOfCharge: 0.4, baseLoadW: 50, pvArrayW: 0, peakSunHours: 0, derating: 1 }, 500, 1);
    expect(b.usableNowWh).toBe(0);
    expect(b.hoursOfHeating).toBe(0);
  });
});
