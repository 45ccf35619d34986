/**
 * The sun for an off-grid budget: declination, day length, noon elevation and the
 * daily extraterrestrial irradiation on a horizontal surface, from Duffie &
 * Beckman, "Solar Engineering of Thermal Processes" (4th ed., 2013): declination
 * eq. 1.6.1b (Spencer 1971), sunset hour angle eq. 1.6.10 generalised to a sunrise
 * altitude, day length eq. 1.6.11, H0 eq. 1.10.3 with Gsc = 1367 W/m².
 *
 * The clear-sky estimate multiplies H0 by a clearness index: 0.7 for a clear winter
 * day is common practice, not a standard figure, and a storm day gives far less.
 * An estimate to start from: the engineer's own figure always wins.
 */
const rad = Math.PI / 180;

/** Day of the year, 1 = 1 January (UTC). */
export function dayOfYear(date: Date): number {
  return (
    Math.floor(
      (Date.UTC(date.getUTCFullYear(), date.getUTCMonth(), date.getUTCDate()) - Date.UTC(date.getUTCFullYear(), 0, 1)) /
        86_400_000,
    ) + 1
  );
}

/** Solar declination in degrees (Spencer 1971; error under 0.035°). */
export function declinationDeg(n: number): number {
  const b = ((n - 1) * 2 * Math.PI) / 365;
  return (
    (0.006918 -
      0.399912 * Math.cos(b) +
      0.070257 * Math.sin(b) -
      0.006758 * Math.cos(2 * b) +
      0.000907 * Math.sin(2 * b) -
      0.002697 * Math.cos(3 * b) +
      0.00148 * Math.sin(3 * b)) /
    rad
  );
}

/** Hour angle (degrees) at which the sun's centre is at `altitudeDeg`; 0 in polar night, 180 in polar day. */
export function sunsetHourAngleDeg(latitudeDeg: number, declDeg: number, altitudeDeg = 0): number {
  const phi = latitudeDeg * rad;
  const d = declDeg * rad;
  const cos = (Math.sin(altitudeDeg * rad) - Math.sin(phi) * Math.sin(d)) / (Math.cos(phi) * Math.cos(d));
  if (cos >= 1) return 0;
  if (cos <= -1) return 180;
  return Math.acos(cos) / rad;
}

/** Hours of daylight; with the usual −0.833° for refraction and the sun's radius, as almanacs give sunrise and sunset. */
export function dayLengthHours(latitudeDeg: number, date: Date, altitudeDeg = -0.833): number {
  return (2 / 15) * sunsetHourAngleDeg(latitudeDeg, declinationDeg(dayOfYear(date)), altitudeDeg);
}

/** Elevation of the sun at solar noon, degrees. */
export function noonElevationDeg(latitudeDeg: number, date: Date): number {
  return 90 - Math.abs(latitudeDeg - declinationDeg(dayOfYear(date)));
}

/** Daily extraterrestrial irradiation on a horizontal surface, kWh/m² (Duffie & Beckman eq. 1.10.3). */
export function extraterrestrialKwhM2(latitudeDeg: number, date: Date): number {
  const n = dayOfYear(date);
  const phi = latitudeDeg * rad;
  const d = declinationDeg(n) * rad;
  const ws = sunsetHourAngleDeg(latitudeDeg, declinationDeg(n)) * rad;
  const gsc = 1367;
  const h0Jm2 =
    ((24 * 3600 * gsc) / Math.PI) *
    (1 + 0.033 * Math.cos((2 * Math.PI * n) / 365)) *
    (Math.cos(phi) * Math.cos(d) * Math.sin(ws) + ws * Math.sin(phi) * Math.sin(d));
  return Math.max(0, h0Jm2) / 3.6e6;
}

/** Clear-sky peak sun hours on a horizontal array: H0 × clearness, in kWh/m² = hours at 1 kW/m². */
export function clearSkyPeakSunHours(latitudeDeg: number, date: Date, clearness = 0.7): number {
  return extraterrestrialKwhM2(latitudeDeg, date) * clearness;
}
