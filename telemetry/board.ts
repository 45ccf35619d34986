import type { LiveReading } from './live';
import { classifyIcing, type IcingState } from './math/icing';

/** What the Board shows per site, and how it ranks sites by need of attention. */
export type BoardController = {
  id: number;
  serial: string;
  kind: string;
  intervalS: number;
  antennaId: number | null;
  status: 'waiting' | 'online' | 'silent' | 'decommissioned';
  latest: LiveReading | null;
  trend: { t: number; v: number | null }[];
  /** the VSWR warning and trip levels of the rules in force for this controller */
  limits: VswrLimits;
};
export type VswrLimits = { warning: number | null; trip: number | null };
export type BoardSite = { siteId: number; controllers: BoardController[] };

export type VswrLevel = 'normal' | 'warning' | 'trip';

export type SiteCondition = {
  worstVswr: number | null;
  /** the worst level any controller's VSWR reaches against its own limits */
  vswrLevel: VswrLevel;
  /** the warning level drawn on the tile's trend */
  warning: number | null;
  icing: IcingState;
  silent: boolean;
  waiting: boolean;
  heaterOn: boolean;
  heaterOffWhileIcing: boolean;
  airTempC: number | null;
  moisture: boolean | null;
  batteryPct: number | null;
  lastTs: string | null;
  attention: number;
};

const icingRank: Record<IcingState, number> = { none: 0, possible: 1, likely: 2, active: 3 };

const levelRank: Record<VswrLevel, number> = { normal: 0, warning: 1, trip: 2 };

export function vswrLevel(vswr: number | null, limits: VswrLimits): VswrLevel {
  if (vswr == null) return 'normal';
  if (limits.trip != null && vswr >= limits.trip) return 'trip';
  if (limits.warning != null && vswr >= limits.warning) return 'warning';
  return 'normal';
}

export function siteCondition(controllers: BoardController[]): SiteCondition {
  let worstVswr: number | null = null;
  let level: VswrLevel = 'normal';
  let icing: IcingState = 'none';
  let heaterOn = false;
  let heaterOffWhileIcing = false;
  let airTempC: number | null = null;
  let moisture: boolean | null = null;
  let batteryPct: number | null = null;
  let lastTs: string | null = null;
  for (const c of controllers) {
    const r = c.latest;
    if (!r) continue;
    if (r.vswr != null && (worstVswr == null || r.vswr > worstVswr)) worstVswr = r.vswr;
    const l = vswrLevel(r.vswr, c.limits);
    if (levelRank[l] > levelRank[level]) level = l;
    const state = classifyIcing({ airTempC: r.airTempC, humidityPct: r.humidityPct, moisture: r.moisture }).state;
    if (icingRank[state] > icingRank[icing]) icing = state;
    if (r.heaterOn) heaterOn = true;
    if (state === 'active' && !r.heaterOn && c.kind !== 'radome-sensor') heaterOffWhileIcing = true;
    airTempC = r.airTempC;
    moisture = r.moisture;
    if (r.batteryPct != null) batteryPct = batteryPct == null ? r.batteryPct : Math.min(batteryPct, r.batteryPct);
    if (!lastTs || r.ts > lastTs) lastTs = r.ts;
  }
  const silent = controllers.some((c) => c.status === 'silent');
  const waiting = controllers.length > 0 && controllers.every((c) => c.status === 'waiting');
  const attention =
    (level === 'trip' ? 100 : level === 'warning' ? 50 : 0) +
    (silent ? 40 : 0) +
    (heaterOffWhileIcing ? 30 : 0) +
    icingRank[icing] * 5 +
    (batteryPct != null && batteryPct < 30 ? 20 : 0);
  const warning = controllers.find((c) => c.limits.warning != null)?.limits.warning ?? null;
  return {
    worstVswr,
    vswrLevel: level,
    warning,
    icing,
    silent,
    waiting,
    heaterOn,
    heaterOffWhileIcing,
    airTempC,
    moisture,
    batteryPct,
    lastTs,
    attention,
  };
}
