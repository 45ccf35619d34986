import { dewPointC, frostPointC } from './psychrometrics';

/**
 * Icing conditions from what a site controller measures. Thresholds follow
 * snow-melt / de-icing controller practice (common practice, not a standard):
 * moisture below about 3 °C (38 °F) calls for heat.
 */
export const icingStates = ['none', 'possible', 'likely', 'active'] as const;
export type IcingState = (typeof icingStates)[number];

export type IcingInput = {
  airTempC: number;
  humidityPct: number | null;
  /** the controller's moisture (precipitation) sensor */
  moisture: boolean | null;
  /** precipitation rate, if a gauge is fitted */
  precipMmH?: number | null;
};

export type IcingSettings = { callForHeatBelowC: number; nearSaturationK: number; fogHumidityPct: number };
export const defaultIcingSettings: IcingSettings = { callForHeatBelowC: 3, nearSaturationK: 1, fogHumidityPct: 95 };

export function classifyIcing(
  input: IcingInput,
  s: IcingSettings = defaultIcingSettings,
): { state: IcingState; why: string } {
  const { airTempC: t } = input;
  const wet = input.moisture === true || (input.precipMmH ?? 0) > 0;
  if (t >= s.callForHeatBelowC) return { state: 'none', why: `air at or above ${s.callForHeatBelowC} °C` };
  if (wet && t <= 0) return { state: 'active', why: 'precipitation at or below freezing' };
  const h = input.humidityPct;
  // near saturation over ice or water: fog, rime or frost can build without a wet sensor
  const nearSat = h != null && h > 0 && t - (t <= 0 ? frostPointC(t, h) : dewPointC(t, h)) <= s.nearSaturationK;
  if (wet) return { state: 'likely', why: 'precipitation just above freezing' };
  if (t <= 0 && h != null && h >= s.fogHumidityPct)
    return { state: 'likely', why: 'freezing fog or rime: near-saturated air below 0 °C' };
  if (nearSat) return { state: 'possible', why: 'air close to its frost or dew point' };
  return { state: 'none', why: 'dry air' };
}

/** Densities of accreted ice, kg/m³: ISO 12494 (glaze 900; hard rime 600–900; soft rime 200–600). */
export const iceDensity = { glaze: 900, hardRime: 750, softRime: 400 } as const;

/**
 * Liquid water content of freezing rain, g/m³, from precipitation rate in mm/h:
 * W = 0.067·P^0.846 (Best 1949, as used by Jones 1998, CRREL).
 */
export const rainWaterContent = (precipMmH: number) => 0.067 * precipMmH ** 0.846;

/**
 * Uniform radial glaze thickness on a horizontal cylinder from freezing rain, by the
 * simple model of Jones (CRREL 1998): R = 1/(ρi·π) Σ √((P·ρo)² + (3.6·V·W)²),
 * one term per hour, P in mm/h, V wind in m/s, ρ in g/cm³; R in mm.
 */
export function freezingRainRadialIceMm(
  hours: { precipMmH: number; windMs: number }[],
  iceDensityKgM3: number = iceDensity.glaze,
): number {
  const rhoI = iceDensityKgM3 / 1000;
  const rhoW = 1;
  let sum = 0;
  for (const h of hours) {
    if (h.precipMmH < 0 || h.windMs < 0) throw new RangeError('Precipitation and wind cannot be negative');
    const vertical = h.precipMmH * rhoW;
    const horizontal = 3.6 * h.windMs * rainWaterContent(h.precipMmH);
    sum += Math.hypot(vertical, horizontal);
  }
  return sum / (rhoI * Math.PI);
}

/** Mass of a radial ice layer t (mm) on a cylinder of diameter d (mm), per metre, kg/m. */
export function iceMassPerMetreKg(
  diameterMm: number,
  thicknessMm: number,
  densityKgM3: number = iceDensity.glaze,
): number {
  const d = diameterMm / 1000;
  const t = thicknessMm / 1000;
  return densityKgM3 * Math.PI * t * (d + t);
}

/**
 * Height factor for design ice thickness, ASCE 7 chapter 10: f_z = (z/33 ft)^0.10
 * for 0 < z ≤ 900 ft, 1.4 above. Takes metres.
 */
export function asceIceHeightFactor(heightM: number): number {
  if (!(heightM > 0)) throw new RangeError('Height must be above ground');
  const zFt = heightM / 0.3048;
  return zFt > 900 ? 1.4 : (zFt / 33) ** 0.1;
}

/** Design ice thickness t_d = 2.0·t·I_i·f_z·(K_zt)^0.35 (ASCE 7 chapter 10), mm in, mm out. */
export function asceDesignIceThicknessMm(nominalMm: number, heightM: number, importance = 1, topographic = 1): number {
  return 2.0 * nominalMm * importance * asceIceHeightFactor(heightM) * topographic ** 0.35;
}
