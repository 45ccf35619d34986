/**
 * Heater energy and the off-grid budget. Energy = kW × hours (common practice);
 * the off-grid arithmetic follows Sandia SAND87-7023, "Stand-Alone Photovoltaic
 * Systems: A Handbook of Recommended Design Practices": daily load in Wh, array
 * output = rating × peak sun hours × derating, usable battery = capacity × allowed
 * depth of discharge, autonomy = usable battery ÷ daily load.
 */

/** Energy of a heater from samples of on/off (each sample holds until the next). */
export function heaterEnergyKwh(samples: { tMs: number; on: boolean }[], heaterKw: number, endMs?: number): number {
  let hours = 0;
  for (let i = 0; i < samples.length; i++) {
    const until = i + 1 < samples.length ? samples[i + 1].tMs : (endMs ?? samples[i].tMs);
    if (samples[i].on) hours += Math.max(0, until - samples[i].tMs) / 3_600_000;
  }
  return hours * heaterKw;
}

/** Season estimate: heater kW × (hours of icing conditions + an after-run per episode). */
export function seasonEnergyKwh(heaterKw: number, icingHours: number, episodes: number, afterRunMin = 30): number {
  return heaterKw * (icingHours + (episodes * afterRunMin) / 60);
}

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
