import { describe, expect, it } from 'vitest';

import {
  asceDesignIceThicknessMm,
  asceIceHeightFactor,
  classifyIcing,
  freezingRainRadialIceMm,
  iceDensity,
  iceMassPerMetreKg,
  rainWaterContent,
} from './icing';
import { ftToM, pcfToKgM3 } from './units';

describe('icing-conditions classifier', () => {
  it('calls for heat with moisture below 3 °C, the de-icing controller practice (common practice, 38 °F)', () => {
    expect(classifyIcing({ airTempC: 2.9, humidityPct: 90, moisture: true }).state).toBe('likely');
    expect(classifyIcing({ airTempC: 3.0, humidityPct: 90, moisture: true }).state).toBe('none');
    expect(classifyIcing({ airTempC: -2, humidityPct: 90, moisture: true }).state).toBe('active');
    expect(classifyIcing({ airTempC: -2, humidityPct: 90, moisture: false, precipMmH: 1.2 }).state).toBe('active');
  });

  it('near-saturated freezing air is likely icing even with a dry sensor (freezing fog, rime: ISO 12494)', () => {
    expect(classifyIcing({ airTempC: -4, humidityPct: 98, moisture: false }).state).toBe('likely');
    expect(classifyIcing({ airTempC: -4, humidityPct: 60, moisture: false }).state).toBe('none');
  });

  it('air within 1 K of its dew point above freezing is possible icing', () => {
    expect(classifyIcing({ airTempC: 1.5, humidityPct: 95, moisture: false }).state).toBe('possible');
  });
});

describe('freezing-rain radial ice (Jones, CRREL 1998)', () => {
  it('liquid water content is 0.067 g/m³ at 1 mm/h', () => {
    // W = 0.067·P^0.846, Jones 1998 after Best 1949.
    expect(rainWaterContent(1)).toBeCloseTo(0.067, 6);
    expect(rainWaterContent(10)).toBeCloseTo(0.067 * 10 ** 0.846, 9);
  });

  it('without wind, radial ice is precipitation divided by π and by ice density', () => {
    // The no-wind limit of Jones's model: a cylinder catches P·D and spreads it over π·D.
    const r = freezingRainRadialIceMm(Array.from({ length: 10 }, () => ({ precipMmH: 1, windMs: 0 })));
    expect(r).toBeCloseTo(10 / (0.9 * Math.PI), 9);
  });

  it('wind adds the horizontal flux in quadrature: 2 mm/h in a 10 m/s wind for an hour is 1.689 mm (worked by hand)', () => {
    // Worked by hand from Jones 1998, eq. 1: W = 0.067 × 2^0.846 = 0.12043 g/m³; horizontal flux 3.6 × 10 × W
    // = 4.3356 mm/h; √(2² + 4.3356²) = 4.7747 mm/h; over π × ice density 0.9: 4.7747 / 2.8274 = 1.6887 mm.
    const p = 2;
    const v = 10;
    const r = freezingRainRadialIceMm([{ precipMmH: p, windMs: v }]);
    expect(r).toBeCloseTo(1.6887, 4);
    expect(r).toBeGreaterThan(freezingRainRadialIceMm([{ precipMmH: p, windMs: 0 }]));
  });

  it('glaze is 900 kg/m³ (ISO 12494) and ASCE 7 asks at least 56 pcf, the same figure', () => {
    expect(iceDensity.glaze).toBe(900);
    expect(pcfToKgM3(56)).toBeCloseTo(897, 0);
  });

  it('ice mass on a conductor follows the annulus area', () => {
    // ρ·π·t·(d+t): geometry of an annulus. 10 mm glaze on a 30 mm rod (the ISO 12494 reference
    // collector diameter): 900·π·0.01·0.04 = 1.131 kg/m.
    expect(iceMassPerMetreKg(30, 10)).toBeCloseTo(1.131, 3);
  });
});

describe('ASCE 7 design ice height factor', () => {
  it('is 1.0 at 33 ft, (900/33)^0.1 at 900 ft and 1.4 above', () => {
    // ASCE 7 chapter 10: f_z = (z/33)^0.10 for 0 < z ≤ 900 ft; 1.4 for z > 900 ft.
    expect(asceIceHeightFactor(ftToM(33))).toBeCloseTo(1, 9);
    expect(asceIceHeightFactor(ftToM(900))).toBeCloseTo(1.392, 3);
    expect(asceIceHeightFactor(ftToM(1000))).toBe(1.4);
  });

  it('design thickness is 2.0·t·I·f_z·Kzt^0.35', () => {
    expect(asceDesignIceThicknessMm(25, ftToM(33))).toBeCloseTo(50, 9);
  });
});
