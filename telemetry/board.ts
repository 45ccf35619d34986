import { classifyIcing, type IcingState } from './math/icing';
import type { LiveReading } from './live';

/** What the Board shows per site, and how it ranks sites by need of attention. */
export type BoardController = {
  id: number; serial: string; kind: string; intervalS: number; antennaId: number | null;
  status: 'waiting' | 'online' | 'silent' | 'decommissioned';
  latest: LiveReading | null;
  trend: { t: number; v: number | null }[];
};
export type BoardSite = { siteId: number; controllers: BoardController[] };

/** Site practice defaults until a site's own rules say otherwise (configurable in Rules). */
export const defaultVswrLimits = { warning: 1.5, trip: 2.0 } as const;

export type SiteCondition = {
  worstVswr: number | null;
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

export function siteCondition(controllers: BoardController[], limits: { warning: number; trip: number } = defaultVswrLimits): SiteCondition {
  let worstVswr: number | null = null;
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
    (worstVswr != null && worstVswr >= limits.trip ? 100 : worstVswr != null && worstVswr >= limits.warning ? 50 : 0) +
    (silent ? 40 : 0) + (heaterOffWhileIcing ? 30 : 0) + icingRank[icing] * 5 + (batteryPct != null && batteryPct < 30 ? 20 : 0);
  return { worstVswr, icing, silent, waiting, heaterOn, heaterOffWhileIcing, airTempC, moisture, batteryPct, lastTs, attention };
}
