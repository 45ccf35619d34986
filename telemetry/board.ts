import { awaitsAck } from './alarms/machine';
import type { LiveReading } from './live';
import { classifyIcing, type IcingState } from './math/icing';
import type { Trend } from './trend';

/** What the Board shows per site, and how it ranks sites by need of attention. */
export type BoardController = {
  id: number;
  serial: string;
  kind: string;
  intervalS: number;
  antennaId: number | null;
  status: 'waiting' | 'online' | 'silent' | 'decommissioned';
  latest: LiveReading | null;
  /** the recent VSWR: an array from the snapshot, a ring once live readings arrive */
  trend: Trend;
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

export type AlarmCounts = {
  /** alarms waiting for someone (unacknowledged, or cleared and not yet acknowledged), by priority */
  waiting: Record<'critical' | 'high' | 'medium' | 'low', number>;
  acknowledged: number;
  shelved: number;
  outOfService: number;
  suppressed: number;
};

/**
 * What the banner on every screen counts: open alarms waiting for someone by
 * priority, and those acknowledged, shelved, suppressed or out of service, so a
 * shelved alarm is counted rather than vanishing.
 */
export function countAlarms(alarms: { priority: string; state: string; closedAt?: string | null }[]): AlarmCounts {
  const c: AlarmCounts = {
    waiting: { critical: 0, high: 0, medium: 0, low: 0 },
    acknowledged: 0,
    shelved: 0,
    outOfService: 0,
    suppressed: 0,
  };
  for (const a of alarms) {
    if (a.closedAt) continue;
    if (awaitsAck(a.state)) {
      if (a.priority in c.waiting) c.waiting[a.priority as keyof AlarmCounts['waiting']]++;
    } else if (a.state === 'acknowledged') c.acknowledged++;
    else if (a.state === 'shelved') c.shelved++;
    else if (a.state === 'out-of-service') c.outOfService++;
    else if (a.state === 'suppressed') c.suppressed++;
  }
  return c;
}

/**
 * The order of regions and sites. On a wall screen positions never move: regions
 * and sites by name, attention shown in place. On a phone, attention first: the
 * region with the site most in need on top, and within a region the sites most in need.
 */
export function orderSites<S extends { id: number; name: string; region: string }>(
  sites: S[],
  attentionOf: (s: S) => number,
  mode: 'stable' | 'attention',
): [string, S[]][] {
  const groups = new Map<string, S[]>();
  for (const s of sites) groups.set(s.region, [...(groups.get(s.region) ?? []), s]);
  const byName = (a: S, b: S) => a.name.localeCompare(b.name);
  if (mode === 'stable') {
    return [...groups.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([r, l]) => [r, [...l].sort(byName)]);
  }
  const score = new Map(sites.map((s) => [s.id, attentionOf(s)]));
  const worst = (l: S[]) => Math.max(0, ...l.map((s) => score.get(s.id)!));
  return [...groups.entries()]
    .map(([r, l]) => [r, [...l].sort((a, b) => score.get(b.id)! - score.get(a.id)! || byName(a, b))] as [string, S[]])
    .sort(([ra, a], [rb, b]) => worst(b) - worst(a) || ra.localeCompare(rb));
}

/**
 * The heater's full-load current from its nameplate and the measured supply volts:
 * I = P / V single-phase, I = P / (√3·V_LL) balanced three-phase (resistive, power factor 1).
 */
export function ratedCurrentA(heaterKw: number | null, phases: 1 | 3, volts: number | null): number | null {
  if (heaterKw == null || volts == null || volts <= 0) return null;
  return (heaterKw * 1000) / ((phases === 3 ? Math.sqrt(3) : 1) * volts);
}

/** A heater switched on that draws less than this share of its rated current is not heating (common practice). */
export const weakHeaterShare = 0.2;

export type AntennaRow = {
  antennaId: number | null;
  name: string;
  controllerIds: number[];
  vswr: number | null;
  level: VswrLevel;
  limits: VswrLimits;
  trend: Trend;
  silent: boolean;
  heater: { on: boolean; currentA: number | null; ratedA: number | null; weak: boolean } | null;
};

type AntennaInfo = { id: number; name: string; heaterKw: number | null; heaterPhases: 1 | 3 };

/**
 * One row per antenna of a site (controllers without an antenna share a "Site" row),
 * each with its own worst VSWR against its own limits, its own trend and its heater's
 * current against rated; the worst rows first.
 */
export function antennaRows(antennas: AntennaInfo[], controllers: BoardController[]): AntennaRow[] {
  const groups = new Map<number | null, BoardController[]>();
  for (const c of controllers) {
    const key = c.antennaId != null && antennas.some((a) => a.id === c.antennaId) ? c.antennaId : null;
    groups.set(key, [...(groups.get(key) ?? []), c]);
  }
  const rows: AntennaRow[] = [];
  for (const [antennaId, list] of groups) {
    const a = antennas.find((x) => x.id === antennaId);
    let vswr: number | null = null;
    let level: VswrLevel = 'normal';
    let limits: VswrLimits = list[0].limits;
    let trend: AntennaRow['trend'] = [];
    let heater: AntennaRow['heater'] = null;
    for (const c of list) {
      const r = c.latest;
      if (c.trend.length > trend.length) trend = c.trend;
      if (!r) continue;
      const l = vswrLevel(r.vswr, c.limits);
      if (r.vswr != null && (vswr == null || r.vswr > vswr)) {
        vswr = r.vswr;
        limits = c.limits;
      }
      if (levelRank[l] > levelRank[level]) level = l;
      if (c.kind !== 'radome-sensor') {
        const ratedA = ratedCurrentA(a?.heaterKw ?? null, a?.heaterPhases ?? 1, r.supplyVolts ?? null);
        const weak =
          r.heaterOn && ratedA != null && r.heaterCurrentA != null && r.heaterCurrentA < weakHeaterShare * ratedA;
        heater = { on: r.heaterOn, currentA: r.heaterCurrentA, ratedA, weak };
      }
    }
    rows.push({
      antennaId: a ? a.id : null,
      name: a ? a.name : 'Site',
      controllerIds: list.map((c) => c.id),
      vswr,
      level,
      limits,
      trend,
      silent: list.some((c) => c.status === 'silent'),
      heater,
    });
  }
  const score = (r: AntennaRow) => levelRank[r.level] * 10 + (r.silent ? 5 : 0) + (r.heater?.weak ? 3 : 0);
  return rows.sort((x, y) => score(y) - score(x) || x.name.localeCompare(y.name));
}
