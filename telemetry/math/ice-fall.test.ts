import { describe, expect, it } from 'vitest';

import { fallWithDrag, freeFall, g, hazardRadius, iceChunk, impactEnergyJ, terminalVelocity } from './ice-fall';

describe('free fall without drag (standard mechanics)', () => {
  it('from 100 m takes 4.516 s and lands at 44.29 m/s', () => {
    // t = √(2h/g), v = g·t with standard gravity 9.80665 m/s².
    const f = freeFall(100);
    expect(f.timeS).toBeCloseTo(4.516, 4);
    expect(f.speedMs).toBeCloseTo(44.287, 3);
  });
  it('v² = 2gh', () => {
    expect(freeFall(250).speedMs ** 2).toBeCloseTo(2 * g * 250, 6);
  });
});

describe('fall with quadratic drag', () => {
  it('terminal velocity satisfies weight = drag', () => {
    // At v_t: m·g = ½·ρ·v_t²·A·Cd (definition).
    const vt = terminalVelocity(2, 0.05, 0.47);
    expect(0.5 * 1.225 * vt * vt * 0.05 * 0.47).toBeCloseTo(2 * g, 9);
  });
  it('tends to free fall when drag is negligible, and is always slower', () => {
    const ff = freeFall(150);
    const nearVacuum = fallWithDrag(150, 1e5);
    expect(nearVacuum.timeS).toBeCloseTo(ff.timeS, 4);
    const real = fallWithDrag(150, 30);
    expect(real.timeS).toBeGreaterThan(ff.timeS);
    expect(real.speedMs).toBeLessThan(30);
  });
  it('matches the closed form t = (v_t/g)·arccosh(exp(g·h/v_t²))', () => {
    const vt = 25;
    const h = 120;
    expect(fallWithDrag(h, vt).timeS).toBeCloseTo((vt / g) * Math.acosh(Math.exp((g * h) / (vt * vt))), 9);
  });
  it('a 1 kg chunk at 30 m/s carries 450 J (½mv²)', () => {
    expect(impactEnergyJ(1, 30)).toBe(450);
  });
  it('a 10 cm glaze sphere weighs 0.471 kg (ISO 12494 glaze density 900 kg/m³)', () => {
    expect(iceChunk(0.1, 'sphere').massKg).toBeCloseTo(0.4712, 4);
  });
});

describe('hazard radius (screening, not a published tower formula)', () => {
  it('uses the stopped-turbine ice-fall distance v·H/15 as a floor (Seifert et al. 2003, no rotor)', () => {
    // Seifert et al. 2003: d = v·(D/2 + H)/15; with D = 0 for a tower: 20 m/s, 150 m → 200 m.
    const hz = hazardRadius({ heightM: 150, windMs: 20, chunkSizeM: 0.3, shape: 'cube' });
    expect(hz.radiusM).toBeGreaterThanOrEqual(200);
  });
  it('grows with wind and height and says what it assumes', () => {
    const calm = hazardRadius({ heightM: 100, windMs: 0 });
    const windy = hazardRadius({ heightM: 100, windMs: 15 });
    expect(calm.radiusM).toBe(50);
    expect(windy.radiusM).toBeGreaterThan(calm.radiusM);
    expect(hazardRadius({ heightM: 200, windMs: 15 }).radiusM).toBeGreaterThan(windy.radiusM);
    expect(windy.assumptions.join(' ')).toMatch(/no published tower-specific formula/);
  });
});

describe('falling-ice calculator figures', () => {
  it('a plate is as thick as asked: 10 cm square, 2 cm thick glaze (900 kg/m³) is 0.18 kg (mass = density × volume)', () => {
    expect(iceChunk(0.1, 'plate', 900, 0.02).massKg).toBeCloseTo(0.18, 12);
    expect(() => iceChunk(0.1, 'plate', 900, 0.2)).toThrow(/Thickness/);
  });

  it('the impact speed adds the wind the radius assumes (resultant of perpendicular speeds), and the energy is ½·m·v² of it', () => {
    const hz = hazardRadius({ heightM: 150, windMs: 12, chunkSizeM: 0.1, shape: 'plate', thicknessM: 0.02 });
    expect(hz.resultantSpeedMs).toBeCloseTo(Math.sqrt(hz.impactSpeedMs ** 2 + 12 ** 2), 12);
    expect(hz.impactEnergyJ).toBeCloseTo(0.5 * hz.massKg * hz.resultantSpeedMs ** 2, 9);
    expect(hz.assumptions.join(' ')).toMatch(/2\.0 cm thick/);
    // with no wind the resultant is the falling speed alone
    const calm = hazardRadius({ heightM: 150, windMs: 0 });
    expect(calm.resultantSpeedMs).toBe(calm.impactSpeedMs);
  });
});
