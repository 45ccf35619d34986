import psychrolib from 'psychrolib';
import { describe, expect, it } from 'vitest';

import {
  alduchovIce,
  alduchovWater,
  dewPointC,
  frostPointC,
  saturationTemperatureC,
  saturationVapourPressureHpa,
  sonntagWater,
  vapourPressureHpa,
} from './psychrometrics';

describe('saturation vapour pressure', () => {
  it('at 0 °C equals the constant C of each fit', () => {
    // Alduchov & Eskridge 1996: C = 6.1094 hPa over water; Sonntag 1990 / WMO CIMO Guide: 6.112 hPa.
    expect(saturationVapourPressureHpa(0)).toBeCloseTo(6.1094, 4);
    expect(saturationVapourPressureHpa(0, sonntagWater)).toBeCloseTo(6.112, 4);
  });

  // Checked against psychrolib (reference library: the ASHRAE Handbook Fundamentals formulation, Hyland and
  // Wexler, over liquid water at or above 0 °C and over ice below it), within 0.5 %.
  const reference = [
    { t: 20, k: alduchovWater },
    { t: 30, k: alduchovWater },
    { t: 5, k: alduchovWater },
    { t: 20, k: sonntagWater },
    { t: -10, k: alduchovIce },
    { t: -20, k: alduchovIce },
    { t: -30, k: alduchovIce },
  ];
  for (const row of reference) {
    it(`${row.k.name} at ${row.t} °C is within 0.5 % of psychrolib`, () => {
      psychrolib.SetUnitSystem(psychrolib.SI);
      const ref = psychrolib.GetSatVapPres(row.t) / 100;
      const e = saturationVapourPressureHpa(row.t, row.k);
      expect(Math.abs(e - ref) / ref).toBeLessThan(0.005);
    });
  }
  // Over supercooled water below 0 °C psychrolib has no formulation (it uses ice there); this one value stays
  // as recalled from the WMO tables [M]: −10 °C, 2.865 hPa.
  it('over supercooled water at −10 °C is within 0.5 % of 2.865 hPa (WMO tables, recalled [M])', () => {
    expect(Math.abs(saturationVapourPressureHpa(-10, alduchovWater) - 2.865) / 2.865).toBeLessThan(0.005);
  });
});

describe('dew point and frost point', () => {
  it('20 °C at 50 % gives a dew point of 9.26 °C', () => {
    // Worked example for the Magnus form with Alduchov & Eskridge constants (shared/references.md).
    expect(dewPointC(20, 50)).toBeCloseTo(9.26, 2);
  });

  it('saturated air has its dew point at the air temperature', () => {
    // Definition of dew point (WMO CIMO Guide).
    expect(dewPointC(-5, 100)).toBeCloseTo(-5, 9);
    expect(dewPointC(12.5, 100, sonntagWater)).toBeCloseTo(12.5, 9);
  });

  it('below freezing the frost point lies between the dew point and the air temperature', () => {
    // Over ice the saturation pressure is lower (WMO CIMO Guide), so frost forms before dew would.
    const td = dewPointC(-8, 85);
    const tf = frostPointC(-8, 85);
    expect(tf).toBeGreaterThan(td);
    expect(tf).toBeLessThan(-8);
  });

  it('at 0 °C air saturated over water is saturated over ice at about 0 °C too', () => {
    // Both fits meet near the triple point (0.01 °C, 6.112 hPa: WMO CIMO Guide).
    expect(frostPointC(0, 100)).toBeCloseTo(0, 1);
  });

  it('rejects humidity outside 0–100 %', () => {
    expect(() => dewPointC(10, 0)).toThrow(RangeError);
    expect(() => dewPointC(10, 101)).toThrow(RangeError);
  });
});

describe('against psychrolib (reference library, ASHRAE Handbook Fundamentals formulation)', () => {
  it('dew and frost points from a vapour pressure agree within 0.35 °C from −30 to 40 °C, 10 to 100 % RH', async () => {
    const psychrolib = (await import('psychrolib')).default;
    psychrolib.SetUnitSystem(psychrolib.SI);
    let worst = 0;
    for (let t = -30; t <= 40; t += 5) {
      for (let rh = 10; rh <= 100; rh += 10) {
        const pa = vapourPressureHpa(t, rh) * 100;
        // psychrolib saturates over ice below 0 °C; its first argument only bounds the search, so it is set high
        const ref = psychrolib.GetTDewPointFromVapPres(60, pa);
        const ours = saturationTemperatureC(pa / 100, ref < 0 ? alduchovIce : alduchovWater);
        worst = Math.max(worst, Math.abs(ref - ours));
      }
    }
    expect(worst).toBeLessThan(0.35);
  });
});
