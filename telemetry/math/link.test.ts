import { describe, expect, it } from 'vitest';
import { freeSpacePathLossDb, geoSlantRangeKm, geostationaryAltitudeKm, linkMarginDb } from './link';
import { kmToMi } from './units';

describe('free-space path loss (ITU-R P.525)', () => {
  it('is 32.45 dB at 1 MHz over 1 km, and 6 dB more per doubling of distance', () => {
    expect(freeSpacePathLossDb(1, 1)).toBeCloseTo(32.45, 9);
    expect(freeSpacePathLossDb(6000, 40) - freeSpacePathLossDb(6000, 20)).toBeCloseTo(6.02, 2);
  });
  it('2.4 GHz over 1 km is 100.05 dB', () => {
    // ITU-R P.525 formula: 32.45 + 20·log10(2400) + 0 = 100.05 dB.
    expect(freeSpacePathLossDb(2400, 1)).toBeCloseTo(100.05, 2);
  });
});

describe('geostationary geometry', () => {
  it('altitude is about 35,786 km (22,236 mi) from Kepler’s third law', () => {
    // GM = 398,600.4418 km³/s², sidereal day 86,164.09 s (shared/references.md [H]).
    expect(geostationaryAltitudeKm()).toBeCloseTo(35786, 0);
    expect(kmToMi(geostationaryAltitudeKm())).toBeCloseTo(22236, -1);
  });
  it('slant range is the altitude at 90° elevation and longer towards the horizon', () => {
    expect(geoSlantRangeKm(90)).toBeCloseTo(geostationaryAltitudeKm(), 6);
    // At 0° elevation: √(r² − Re²) ≈ 41,679 km (geometry of the tangent line, [M]).
    expect(geoSlantRangeKm(0)).toBeCloseTo(41679, -1);
  });
  it('a cover loss comes straight off the margin', () => {
    const base = { eirpDbw: 50, pathLossDb: 200, receiveGainDb: 45, thresholdDbw: -120 };
    expect(linkMarginDb({ ...base, coverLossDb: 0 }) - linkMarginDb({ ...base, coverLossDb: 3 })).toBe(3);
  });
});
