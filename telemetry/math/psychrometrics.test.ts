import { describe, expect, it } from 'vitest';
import { alduchovIce, alduchovWater, dewPointC, frostPointC, saturationTemperatureC, saturationVapourPressureHpa, sonntagWater, vapourPressureHpa } from './psychrometrics';

describe('saturation vapour pressure', () => {
  it('at 0 °C equals the constant C of each fit', () => {
    // Alduchov & Eskridge 1996: C = 6.1094 hPa over water; Sonntag 1990 / WMO CIMO Guide: 6.112 hPa.
    expect(saturationVapourPressureHpa(0)).toBeCloseTo(6.1094, 4);
    expect(saturationVapourPressureHpa(0, sonntagWater)).toBeCloseTo(6.112, 4);
  });

  // Smithsonian Meteorological Tables / WMO tables of saturation vapour pressure
  // (values recalled [M]): 20 °C 23.39 hPa, 30 °C 42.47 hPa over water; −10 °C
  // 2.865 hPa over supercooled water, 2.599 hPa over ice; −20 °C 1.032 hPa over ice.
  const tables = [
    { t: 20, k: alduchovWater, e: 23.39 },
    { t: 30, k: alduchovWater, e: 42.47 },
    { t: -10, k: alduchovWater, e: 2.865 },
    { t: -10, k: alduchovIce, e: 2.599 },
    { t: -20, k: alduchovIce, e: 1.032 },
    { t: 20, k: sonntagWater, e: 23.39 },
  ];
  for (const row of tables) {
    it(`${row.k.name} at ${row.t} °C is within 0.5 % of ${row.e} hPa`, () => {
      const e = saturationVapourPressureHpa(row.t, row.k);
      expect(Math.abs(e - row.e) / row.e).toBeLessThan(0.005);
    });
  }
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
