/** Link-budget helpers for microwave and satellite services. */

/** Free-space path loss, ITU-R P.525: L = 32.45 + 20·log10(f MHz) + 20·log10(d km), dB. */
export function freeSpacePathLossDb(freqMHz: number, distanceKm: number): number {
  if (!(freqMHz > 0 && distanceKm > 0)) throw new RangeError('Frequency and distance must be above 0');
  return 32.45 + 20 * Math.log10(freqMHz) + 20 * Math.log10(distanceKm);
}

export const earthGm = 398_600.4418; // km³/s², WGS 84
export const siderealDayS = 86_164.09;
export const earthEquatorialRadiusKm = 6378.137; // WGS 84

/** Geostationary orbit radius from Kepler's third law: r = (GM·T²/4π²)^(1/3). */
export function geostationaryRadiusKm(): number {
  return Math.cbrt((earthGm * siderealDayS ** 2) / (4 * Math.PI ** 2));
}

export const geostationaryAltitudeKm = () => geostationaryRadiusKm() - earthEquatorialRadiusKm;

/** Slant range from an earth station to a geostationary satellite at an elevation angle (spherical earth). */
export function geoSlantRangeKm(elevationDeg: number): number {
  if (!(elevationDeg >= 0 && elevationDeg <= 90)) throw new RangeError('Elevation must be 0–90°');
  const re = earthEquatorialRadiusKm;
  const r = geostationaryRadiusKm();
  const el = (elevationDeg * Math.PI) / 180;
  return Math.sqrt(r * r - (re * Math.cos(el)) ** 2) - re * Math.sin(el);
}

/**
 * Extra loss from a wet or iced radome or reflector: no single published figure
 * applies to every band and cover, so the loss is the engineer's measured or
 * vendor figure, in dB, added to the budget (papers such as Kurri & Huuskonen
 * 2008 show it grows with frequency and water film thickness).
 */
export function linkMarginDb(p: { eirpDbw: number; pathLossDb: number; receiveGainDb: number; coverLossDb: number; thresholdDbw: number }): number {
  return p.eirpDbw - p.pathLossDb - p.coverLossDb + p.receiveGainDb - p.thresholdDbw;
}
