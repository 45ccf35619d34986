/**
 * Falling ice. Standard mechanics: without drag t = √(2h/g), v = g·t; with
 * quadratic drag v_t = √(2mg/(ρ·A·Cd)), t(h) = (v_t/g)·arccosh(exp(g·h/v_t²)),
 * v(h) = v_t·√(1 − exp(−2gh/v_t²)). Horizontal drift is bounded above by wind
 * speed × fall time (common practice). No published tower-specific hazard formula
 * was found; the radius here is a screening figure with its assumptions stated.
 */
export const g = 9.80665; // standard gravity, m/s² (CGPM 1901)
export const airDensity = 1.225; // ISA sea level, kg/m³ (ICAO standard atmosphere)
/** Wind assumed for the screening radius where a site measures none (stated on screen; a strong breeze). */
export const screeningWindMs = 15;

/** Drag coefficients from fluid-mechanics tables (high Reynolds number). */
export const dragCoefficient = { sphere: 0.47, cube: 1.05, plate: 1.28 } as const;
export type ChunkShape = keyof typeof dragCoefficient;

export function freeFall(heightM: number) {
  if (!(heightM > 0)) throw new RangeError('Height must be above 0 m');
  const t = Math.sqrt((2 * heightM) / g);
  return { timeS: t, speedMs: g * t };
}

export function terminalVelocity(massKg: number, areaM2: number, cd: number, rho = airDensity): number {
  if (!(massKg > 0 && areaM2 > 0 && cd > 0)) throw new RangeError('Mass, area and drag coefficient must be above 0');
  return Math.sqrt((2 * massKg * g) / (rho * areaM2 * cd));
}

export function fallWithDrag(heightM: number, vt: number) {
  if (!(heightM > 0)) throw new RangeError('Height must be above 0 m');
  const x = (g * heightM) / (vt * vt);
  // arccosh(e^x) = x + ln(1 + √(1 − e^(−2x))), stable for large x
  const timeS = (vt / g) * (x + Math.log(1 + Math.sqrt(1 - Math.exp(-2 * x))));
  const speedMs = vt * Math.sqrt(1 - Math.exp(-2 * x));
  return { timeS, speedMs };
}

/**
 * A chunk of ice described by its size and shape; glaze density by default (ISO 12494).
 * A plate is `sizeM` square and `thicknessM` thick (a tenth of its side unless given), falling flat.
 */
export function iceChunk(sizeM: number, shape: ChunkShape, densityKgM3 = 900, thicknessM?: number) {
  if (!(sizeM > 0)) throw new RangeError('Size must be above 0');
  if (thicknessM != null && !(thicknessM > 0 && thicknessM <= sizeM))
    throw new RangeError('Thickness must be above 0 and at most the size');
  if (shape === 'sphere') {
    const r = sizeM / 2;
    return { massKg: densityKgM3 * (4 / 3) * Math.PI * r ** 3, areaM2: Math.PI * r * r, cd: dragCoefficient.sphere };
  }
  if (shape === 'cube') return { massKg: densityKgM3 * sizeM ** 3, areaM2: sizeM * sizeM, cd: dragCoefficient.cube };
  return {
    massKg: densityKgM3 * sizeM * sizeM * (thicknessM ?? sizeM * 0.1),
    areaM2: sizeM * sizeM,
    cd: dragCoefficient.plate,
  };
}

export const impactEnergyJ = (massKg: number, speedMs: number) => 0.5 * massKg * speedMs * speedMs;

export type HazardInput = {
  heightM: number;
  windMs: number;
  chunkSizeM?: number;
  shape?: ChunkShape;
  thicknessM?: number;
  structureRadiusM?: number;
};

export type Hazard = {
  radiusM: number;
  fallTimeS: number;
  massKg: number;
  /** vertical speed at the ground, with drag */
  impactSpeedMs: number;
  /** with the horizontal wind speed the drift assumes: √(vertical² + wind²), an upper bound */
  resultantSpeedMs: number;
  /** ½·m·v² at the resultant speed */
  impactEnergyJ: number;
  assumptions: string[];
};

/**
 * Screening radius around a tower: the horizontal offset of the structure plus
 * wind × fall time of a chunk falling from the top with drag (drift upper bound),
 * and never less than the ice-fall screening distance v·H/15 used for stopped
 * wind turbines (Seifert et al. 2003, rotor term removed), nor than half the height.
 */
export function hazardRadius(input: HazardInput): Hazard {
  const { heightM, windMs } = input;
  if (windMs < 0) throw new RangeError('Wind speed cannot be negative');
  const shape = input.shape ?? 'plate';
  const chunk = iceChunk(input.chunkSizeM ?? 0.1, shape, 900, shape === 'plate' ? input.thicknessM : undefined);
  const vt = terminalVelocity(chunk.massKg, chunk.areaM2, chunk.cd);
  const fall = fallWithDrag(heightM, vt);
  const drift = windMs * fall.timeS;
  const seifert = (windMs * heightM) / 15;
  const radiusM = (input.structureRadiusM ?? 0) + Math.max(drift, seifert, heightM / 2);
  // the drift assumes the chunk moves with the wind, so it lands with the wind's speed as well
  const resultantSpeedMs = Math.hypot(fall.speedMs, windMs);
  const thick =
    shape === 'plate' ? ` × ${((input.thicknessM ?? (input.chunkSizeM ?? 0.1) * 0.1) * 100).toFixed(1)} cm thick` : '';
  return {
    radiusM,
    fallTimeS: fall.timeS,
    massKg: chunk.massKg,
    impactSpeedMs: fall.speedMs,
    resultantSpeedMs,
    impactEnergyJ: impactEnergyJ(chunk.massKg, resultantSpeedMs),
    assumptions: [
      `ice leaves the top of the structure (${heightM} m) with no horizontal speed of its own`,
      `wind of ${windMs} m/s at every height carries it for the whole fall (an upper bound)`,
      `a ${(input.chunkSizeM ?? 0.1) * 100} cm ${shape}${thick} of glaze ice (900 kg/m³, ${chunk.massKg.toFixed(3)} kg), air at sea-level density`,
      'it lands moving with the wind as well as falling: the impact speed is the resultant of both',
      'never less than half the structure height, nor the stopped-turbine ice-fall screening distance v·H/15',
      'no published tower-specific formula exists: follow the site safety plan and local codes',
    ],
  };
}
