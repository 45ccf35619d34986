/**
 * Heater energy and the off-grid budget. Energy is integrated from measured
 * volts and amps; nameplate kW × hours on (common practice) only where they are not measured;
 * the off-grid arithmetic follows Sandia SAND87-7023, "Stand-Alone Photovoltaic
 * Systems: A Handbook of Recommended Design Practices": daily load in Wh, array
 * output = rating × peak sun hours × derating, usable battery = capacity × allowed
 * depth of discharge, autonomy = usable battery ÷ daily load.
 */

export type HeaterSpec = {
  /** nameplate rating, kW: only for the estimate where current is not measured */
  ratedKw: number | null;
  /** 1: single-phase, P = V·I; 3: balanced three-phase resistive load on line-to-line volts, P = √3·V_LL·I */
  phases: 1 | 3;
};

/**
 * Electric power of a resistive heater (power factor 1) from measured supply volts
 * and line current. Single-phase P = V·I; balanced three-phase P = √3·V_LL·I_L
 * (IEC 60050-131 / any circuits text, e.g. Hughes Electrical and Electronic Technology, ch. 41).
 */
export function heaterPowerW(volts: number, amps: number, phases: 1 | 3): number {
  return (phases === 3 ? Math.sqrt(3) : 1) * volts * amps;
}

export type PowerSample = { tMs: number; on: boolean; currentA: number | null; volts: number | null };

export type HeaterEnergy = {
  kwh: number;
  /** from measured volts and amps */
  measuredKwh: number;
  /** nameplate × time on, where current or volts were not measured */
  estimatedKwh: number;
  basis: 'measured' | 'estimated' | 'mixed' | 'none';
  /** hours the heater was on, over the time covered by samples */
  onHours: number;
  /** hours covered by samples close enough together to integrate */
  coveredHours: number;
  /** stretches left out because the samples were too far apart, and their length */
  gaps: number;
  gapHours: number;
};

const basisOf = (measured: number, estimated: number, any: boolean): HeaterEnergy['basis'] =>
  !any ? 'none' : measured > 0 && estimated > 0 ? 'mixed' : estimated > 0 ? 'estimated' : 'measured';

/**
 * Heater energy from a controller's samples by the trapezoid rule on measured power
 * P(t) (common numerical practice). Between two samples more than `maxGapIntervals`
 * reporting intervals apart nothing is assumed: the stretch is left out and counted.
 * Where current or volts are missing, the stretch is estimated as nameplate × the
 * share of its two samples that were on, and reported apart as "estimated".
 */
export function heaterEnergy(
  samples: PowerSample[],
  spec: HeaterSpec,
  opts: { intervalS: number; maxGapIntervals?: number },
): HeaterEnergy {
  const maxGapMs = opts.intervalS * 1000 * (opts.maxGapIntervals ?? 3);
  let measuredWs = 0;
  let estimatedWs = 0;
  let onMs = 0;
  let coveredMs = 0;
  let gaps = 0;
  let gapMs = 0;
  const s = [...samples].sort((a, b) => a.tMs - b.tMs);
  for (let i = 1; i < s.length; i++) {
    const a = s[i - 1];
    const b = s[i];
    const dt = b.tMs - a.tMs;
    if (dt <= 0) continue;
    if (dt > maxGapMs) {
      gaps++;
      gapMs += dt;
      continue;
    }
    coveredMs += dt;
    const onShare = (Number(a.on) + Number(b.on)) / 2;
    onMs += onShare * dt;
    if (a.currentA != null && a.volts != null && b.currentA != null && b.volts != null) {
      measuredWs +=
        ((heaterPowerW(a.volts, a.currentA, spec.phases) + heaterPowerW(b.volts, b.currentA, spec.phases)) / 2) *
        (dt / 1000);
    } else if (spec.ratedKw != null) {
      estimatedWs += spec.ratedKw * 1000 * onShare * (dt / 1000);
    }
  }
  const measuredKwh = measuredWs / 3.6e6;
  const estimatedKwh = estimatedWs / 3.6e6;
  return {
    kwh: measuredKwh + estimatedKwh,
    measuredKwh,
    estimatedKwh,
    basis: basisOf(measuredWs, estimatedWs, coveredMs > 0),
    onHours: onMs / 3.6e6,
    coveredHours: coveredMs / 3.6e6,
    gaps,
    gapHours: gapMs / 3.6e6,
  };
}

/**
 * Rollup minutes summed over a stretch (one minute, an hour…): minutes with readings,
 * seconds on, Σ over measured minutes of mean(V·I) × 60 s, and seconds on in minutes
 * without a measurement (for the nameplate estimate).
 */
export type PowerBucket = { startMs: number; minutes: number; onS: number; viWs: number; unmeasuredOnS: number };

/**
 * The same figure from minute rollups, for long ranges: each minute with readings
 * stands for 60 s at its mean measured power (the rectangle rule, equal to the
 * trapezoid for evenly spaced samples up to the ends). Buckets must be in order;
 * missing minutes inside a bucket, and between buckets, count as gaps.
 */
export function heaterEnergyFromBuckets(buckets: PowerBucket[], spec: HeaterSpec, bucketS = 60): HeaterEnergy {
  const k = spec.phases === 3 ? Math.sqrt(3) : 1;
  let viWs = 0;
  let estimatedWs = 0;
  let onS = 0;
  let covered = 0;
  let gaps = 0;
  let gapS = 0;
  let prevEnd: number | null = null;
  for (const b of buckets) {
    if (b.minutes <= 0) continue;
    if (prevEnd != null && b.startMs > prevEnd) {
      gaps++;
      gapS += (b.startMs - prevEnd) / 1000;
    }
    const missing = Math.max(0, bucketS / 60 - b.minutes);
    if (bucketS > 60 && missing > 0) gapS += missing * 60;
    prevEnd = b.startMs + bucketS * 1000;
    covered += b.minutes * 60;
    onS += b.onS;
    viWs += b.viWs;
    if (spec.ratedKw != null) estimatedWs += spec.ratedKw * 1000 * b.unmeasuredOnS;
  }
  const measuredKwh = (k * viWs) / 3.6e6;
  const estimatedKwh = estimatedWs / 3.6e6;
  return {
    kwh: measuredKwh + estimatedKwh,
    measuredKwh,
    estimatedKwh,
    basis: basisOf(viWs, estimatedWs, covered > 0),
    onHours: onS / 3600,
    coveredHours: covered / 3600,
    gaps,
    gapHours: gapS / 3600,
  };
}

/** A minute of rollup: readings, how many were on, and the sum and count of measured V·I. */
export type PowerMinute = { minuteMs: number; n: number; onN: number; viSum: number; viN: number };

/** One rollup minute as a bucket. */
export const minuteBucket = (m: PowerMinute): PowerBucket => ({
  startMs: m.minuteMs,
  minutes: m.n > 0 ? 1 : 0,
  onS: (m.onN / Math.max(1, m.n)) * 60,
  viWs: m.viN > 0 ? (m.viSum / m.viN) * 60 : 0,
  unmeasuredOnS: m.viN > 0 ? 0 : (m.onN / Math.max(1, m.n)) * 60,
});

export const heaterEnergyFromMinutes = (minutes: PowerMinute[], spec: HeaterSpec) =>
  heaterEnergyFromBuckets([...minutes].sort((a, b) => a.minuteMs - b.minuteMs).map(minuteBucket), spec);

export type OffGridSite = {
  batteryKwh: number;
  /** allowed depth of discharge, 0–1 */
  depthOfDischarge: number;
  /** state of charge now, 0–1 */
  stateOfCharge: number;
  /** continuous load other than the heater (radio, controller), W */
  baseLoadW: number;
  pvArrayW: number;
  peakSunHours: number;
  /** combined derating of array and battery path, 0–1 */
  derating: number;
};

export function dailyPvWh(site: Pick<OffGridSite, 'pvArrayW' | 'peakSunHours' | 'derating'>): number {
  return site.pvArrayW * site.peakSunHours * site.derating;
}

/** Days of autonomy: usable battery energy over daily load (no sun). */
export function autonomyDays(batteryKwh: number, depthOfDischarge: number, dailyLoadWh: number): number {
  if (!(dailyLoadWh > 0)) throw new RangeError('Daily load must be above 0');
  return (batteryKwh * 1000 * depthOfDischarge) / dailyLoadWh;
}

/** Battery capacity for a daily load, days of autonomy and depth of discharge (Sandia sizing). */
export function batteryForAutonomyKwh(dailyLoadWh: number, days: number, depthOfDischarge: number): number {
  return (dailyLoadWh * days) / depthOfDischarge / 1000;
}

export type HeatBudget = {
  usableNowWh: number;
  netDrawW: number;
  /** hours of heating before the battery reaches its allowed depth; Infinity if the sun keeps up */
  hoursOfHeating: number;
  canHeatThroughStorm: boolean;
};

/**
 * Can this site afford to heat through a storm of `stormHours`, and for how long?
 * Sun during a storm is taken as `stormSunFraction` of a normal day (default: none).
 */
export function heatBudget(site: OffGridSite, heaterW: number, stormHours: number, stormSunFraction = 0): HeatBudget {
  const floorSoc = 1 - site.depthOfDischarge;
  const usableNowWh = Math.max(0, (site.stateOfCharge - floorSoc) * site.batteryKwh * 1000);
  const sunW = (dailyPvWh(site) * stormSunFraction) / 24;
  const netDrawW = heaterW + site.baseLoadW - sunW;
  const hoursOfHeating = netDrawW <= 0 ? Infinity : usableNowWh / netDrawW;
  return { usableNowWh, netDrawW, hoursOfHeating, canHeatThroughStorm: hoursOfHeating >= stormHours };
}
