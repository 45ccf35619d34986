/**
 * Saturation vapour pressure, dew point and frost point in the Magnus form
 * e_s(T) = C·exp(a·T/(b+T)), T in °C, e_s in hPa.
 */
export type MagnusConstants = { c: number; a: number; b: number; name: string };

/** Alduchov & Eskridge 1996, J. Appl. Meteor. 35, over water (AERK). */
export const alduchovWater: MagnusConstants = {
  c: 6.1094,
  a: 17.625,
  b: 243.04,
  name: 'Alduchov & Eskridge 1996, water',
};
/** Alduchov & Eskridge 1996, over ice (AERKi). */
export const alduchovIce: MagnusConstants = { c: 6.1121, a: 22.587, b: 273.86, name: 'Alduchov & Eskridge 1996, ice' };
/** Sonntag 1990, as in the WMO CIMO Guide, over water. */
export const sonntagWater: MagnusConstants = { c: 6.112, a: 17.62, b: 243.12, name: 'Sonntag 1990, water' };

export function saturationVapourPressureHpa(tempC: number, k: MagnusConstants = alduchovWater): number {
  return k.c * Math.exp((k.a * tempC) / (k.b + tempC));
}

export function vapourPressureHpa(tempC: number, humidityPct: number, k: MagnusConstants = alduchovWater): number {
  checkHumidity(humidityPct);
  return (humidityPct / 100) * saturationVapourPressureHpa(tempC, k);
}

/** The temperature at which the given vapour pressure saturates (inverse of Magnus). */
export function saturationTemperatureC(vapourHpa: number, k: MagnusConstants): number {
  if (!(vapourHpa > 0)) throw new RangeError('Vapour pressure must be above 0');
  const g = Math.log(vapourHpa / k.c);
  return (k.b * g) / (k.a - g);
}

function checkHumidity(h: number) {
  if (!(h > 0 && h <= 100)) throw new RangeError('Relative humidity must be above 0 and at most 100 %');
}

/** Dew point over water; humidity is relative to water, as meteorological hygrometers report it. */
export function dewPointC(tempC: number, humidityPct: number, k: MagnusConstants = alduchovWater): number {
  return saturationTemperatureC(vapourPressureHpa(tempC, humidityPct, k), k);
}

/** Frost point: where the same vapour would saturate over ice. */
export function frostPointC(
  tempC: number,
  humidityPct: number,
  water: MagnusConstants = alduchovWater,
  ice: MagnusConstants = alduchovIce,
): number {
  return saturationTemperatureC(vapourPressureHpa(tempC, humidityPct, water), ice);
}
