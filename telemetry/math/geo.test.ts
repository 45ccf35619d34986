import geographiclib from 'geographiclib';
import { describe, expect, it } from 'vitest';

import { greatCircleKm, nearest } from './geo';

// Reference: GeographicLib's geodesic inverse on the WGS84 ellipsoid (Karney, "Algorithms for geodesics",
// J. Geodesy 87, 2013), the library the registry carries. A sphere differs from the ellipsoid by up to about 0.5 %.
const wgs84Km = (a: [number, number], b: [number, number]) =>
  geographiclib.Geodesic.WGS84.Inverse(a[0], a[1], b[0], b[1]).s12! / 1000;

describe('great-circle distance between sites', () => {
  it('is within 0.5 % of the WGS84 geodesic over short and long lines, at high and low latitudes', () => {
    const lines: [[number, number], [number, number]][] = [
      [
        [61.21, 14.02],
        [61.48, 13.55],
      ], // two demo sites, ~36 km
      [
        [58.55, 16.9],
        [61.66, 14.3],
      ], // across the demo network, ~370 km
      [
        [0, 0],
        [0, 1],
      ], // a degree along the equator, where the sphere is shortest against the ellipsoid
      [
        [60, 10],
        [60, 11],
      ], // a degree east at 60° N
      [
        [-33.9, 18.4],
        [51.5, -0.1],
      ], // a long line across the equator
    ];
    for (const [a, b] of lines) {
      const ref = wgs84Km(a, b);
      const ours = greatCircleKm({ latitude: a[0], longitude: a[1] }, { latitude: b[0], longitude: b[1] });
      expect(
        Math.abs(ours - ref) / ref,
        `${a} → ${b}: ${ours.toFixed(3)} km against ${ref.toFixed(3)} km`,
      ).toBeLessThan(0.005);
    }
  });

  it('a quarter of a meridian on the sphere is π R / 2 (10 007.5 km for R = 6371.0088 km)', () => {
    expect(greatCircleKm({ latitude: 0, longitude: 0 }, { latitude: 90, longitude: 0 })).toBeCloseTo(
      (Math.PI * 6371.0088) / 2,
      6,
    );
  });

  it('lists the nearest other sites, closest first', () => {
    const s = [
      { id: 1, latitude: 61.21, longitude: 14.02 },
      { id: 2, latitude: 61.48, longitude: 13.55 },
      { id: 3, latitude: 58.55, longitude: 16.9 },
      { id: 4, latitude: 60.97, longitude: 14.61 },
    ];
    // the order the WGS84 geodesic gives
    const byRef = s
      .slice(1)
      .map((x) => ({ id: x.id, km: wgs84Km([s[0].latitude, s[0].longitude], [x.latitude, x.longitude]) }))
      .sort((a, b) => a.km - b.km)
      .map((x) => x.id);
    expect(nearest(s[0], s, 3).map((x) => x.site.id)).toEqual(byRef);
  });
});
