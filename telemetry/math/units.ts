/** Conversions for people who think in °F, feet, miles and Btu. Exact factors by definition. */
export const cToF = (c: number) => (c * 9) / 5 + 32;
export const fToC = (f: number) => ((f - 32) * 5) / 9;
/** International foot: 0.3048 m exactly (1959 agreement). */
export const mToFt = (m: number) => m / 0.3048;
export const ftToM = (ft: number) => ft * 0.3048;
/** Statute mile: 1609.344 m exactly. */
export const kmToMi = (km: number) => (km * 1000) / 1609.344;
export const msToMph = (ms: number) => (ms * 3600) / 1609.344;
export const msToKmh = (ms: number) => ms * 3.6;
export const mmToIn = (mm: number) => mm / 25.4;
/** International Table Btu: 1 kWh = 3412.14 Btu. */
export const kWhToBtu = (kwh: number) => kwh * 3412.1416;
/** pound-mass 0.45359237 kg, foot 0.3048 m: 1 lb/ft³ = 16.0185 kg/m³. */
export const pcfToKgM3 = (pcf: number) => (pcf * 0.45359237) / 0.3048 ** 3;
export const dbmToW = (dbm: number) => 10 ** ((dbm - 30) / 10);
export const wToDbm = (w: number) => 10 * Math.log10(w) + 30;
