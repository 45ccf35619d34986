/**
 * Distances between sites on the ground. The great circle on a sphere of the IUGG
 * mean Earth radius R1 = 6371.0088 km (Moritz, "Geodetic Reference System 1980",
 * Bulletin Géodésique 54, 1980) by the haversine formula (Sinnott, "Virtues of the
 * Haversine", Sky & Telescope 68(2), 1984). Against the WGS84 ellipsoid it is within
 * about 0.5 %, plenty for "how far is the next site".
 */
export const meanEarthRadiusKm = 6371.0088;

export type LatLon = { latitude: number; longitude: number };

export function greatCircleKm(a: LatLon, b: LatLon): number {
  const rad = Math.PI / 180;
  const dLat = (b.latitude - a.latitude) * rad;
  const dLon = (b.longitude - a.longitude) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.latitude * rad) * Math.cos(b.latitude * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * meanEarthRadiusKm * Math.asin(Math.min(1, Math.sqrt(h)));
}

/** The other sites nearest to one, closest first. */
export function nearest<T extends LatLon & { id: number }>(from: T, sites: T[], n = 3): { site: T; km: number }[] {
  return sites
    .filter((s) => s.id !== from.id)
    .map((site) => ({ site, km: greatCircleKm(from, site) }))
    .sort((x, y) => x.km - y.km)
    .slice(0, n);
}
