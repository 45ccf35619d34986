/**
 * Alarm-rate statistics for the Reports, benchmarked against ISA-18.2 / EEMUA 191:
 * about 1 alarm per 10 minutes per operator is very likely acceptable, 2 is the
 * most that is manageable, and a flood starts above 10 alarms in 10 minutes. The
 * end of a flood below 5 per 10 minutes, chattering as 3 or more raises of one
 * alarm within a minute, and stale as standing over 24 hours are common practice
 * in alarm-management work.
 */
import type { Priority } from './machine';

export const benchmarks = {
  acceptablePer10Min: 1,
  manageablePer10Min: 2,
  floodStartsAbovePer10Min: 10,
  floodEndsBelowPer10Min: 5,
  chatterCount: 3,
  chatterWindowMs: 60_000,
  staleAfterMs: 24 * 3_600_000,
  /** an activation that returns to normal this soon is fleeting (common practice; no standard figure) */
  fleetingMs: 5_000,
  /** recommended share of annunciated alarms by priority (EEMUA 191, approximate) */
  priorityShare: { low: 0.8, medium: 0.15, high: 0.05 },
} as const;

export type AlarmRecord = {
  source: string;
  priority: Priority;
  raisedMs: number;
  ackMs: number | null;
  clearedMs: number | null;
};

const tenMin = 600_000;

export function ratePer10Min(alarms: AlarmRecord[], fromMs: number, toMs: number): number[] {
  const bins = new Array(Math.max(1, Math.ceil((toMs - fromMs) / tenMin))).fill(0);
  for (const a of alarms) {
    if (a.raisedMs < fromMs || a.raisedMs >= toMs) continue;
    bins[Math.floor((a.raisedMs - fromMs) / tenMin)]++;
  }
  return bins;
}

export type Flood = { startMs: number; endMs: number; count: number };

export function floods(bins: number[], fromMs: number): Flood[] {
  const out: Flood[] = [];
  let cur: Flood | null = null;
  bins.forEach((n, i) => {
    const t = fromMs + i * tenMin;
    if (!cur && n > benchmarks.floodStartsAbovePer10Min) cur = { startMs: t, endMs: t + tenMin, count: n };
    else if (cur && n >= benchmarks.floodEndsBelowPer10Min) {
      cur.endMs = t + tenMin;
      cur.count += n;
    } else if (cur) {
      out.push(cur);
      cur = null;
    }
  });
  if (cur) out.push(cur);
  return out;
}

/** One alarm's recorded transitions, as the alarm_events table keeps them. */
export type AlarmTransition = { alarmId: number; source: string; priority: Priority; atMs: number; transition: string };

/**
 * Annunciations, not alarm rows: ISA-18.2 and EEMUA 191 count each time an alarm
 * is presented to the operator, so an alarm that returns to normal and comes back
 * twenty times is twenty alarms. Each activation ('raised' or 'reactivated')
 * becomes a record; its acknowledgement and return are the next ones that follow.
 */
export function annunciations(events: AlarmTransition[]): AlarmRecord[] {
  // one alarm row's transitions follow each other; rows of one source are counted together later
  const byAlarm = new Map<number, AlarmTransition[]>();
  for (const e of events) byAlarm.set(e.alarmId, [...(byAlarm.get(e.alarmId) ?? []), e]);
  const out: AlarmRecord[] = [];
  for (const list of byAlarm.values()) {
    list.sort((a, b) => a.atMs - b.atMs);
    let cur: AlarmRecord | null = null;
    for (const e of list) {
      if (e.transition === 'raised' || e.transition === 'reactivated') {
        cur = { source: e.source, priority: e.priority, raisedMs: e.atMs, ackMs: null, clearedMs: null };
        out.push(cur);
      } else if (cur && e.transition === 'acknowledged' && cur.ackMs == null) cur.ackMs = e.atMs;
      else if (cur && e.transition === 'returned' && cur.clearedMs == null) cur.clearedMs = e.atMs;
    }
  }
  return out.sort((a, b) => a.raisedMs - b.raisedMs);
}

export type Offender = { source: string; activations: number; mostInOneMinute: number; fleeting: number };

/**
 * The alarms an engineer should fix first: chattering ones (3 or more activations
 * within one minute) and fleeting ones (back to normal within `fleetingMs`), with
 * their counts. Both thresholds are common practice (the ISA-18.2 technical
 * reports describe chattering and fleeting alarms without fixing numbers).
 */
export function badActors(alarms: AlarmRecord[]): { chattering: Offender[]; fleeting: Offender[] } {
  const bySource = new Map<string, AlarmRecord[]>();
  for (const a of alarms) bySource.set(a.source, [...(bySource.get(a.source) ?? []), a]);
  const all: Offender[] = [];
  for (const [source, list] of bySource) {
    const times = list.map((a) => a.raisedMs).sort((x, y) => x - y);
    let most = 0;
    for (let i = 0, j = 0; j < times.length; j++) {
      while (times[j] - times[i] > benchmarks.chatterWindowMs) i++;
      most = Math.max(most, j - i + 1);
    }
    const fleeting = list.filter(
      (a) => a.clearedMs != null && a.clearedMs - a.raisedMs <= benchmarks.fleetingMs,
    ).length;
    all.push({ source, activations: list.length, mostInOneMinute: most, fleeting });
  }
  const order = (a: Offender, b: Offender) => b.activations - a.activations || a.source.localeCompare(b.source);
  return {
    chattering: all.filter((o) => o.mostInOneMinute >= benchmarks.chatterCount).sort(order),
    fleeting: all.filter((o) => o.fleeting > 0).sort((a, b) => b.fleeting - a.fleeting || order(a, b)),
  };
}

export function stale(alarms: AlarmRecord[], nowMs: number): AlarmRecord[] {
  return alarms.filter((a) => a.clearedMs == null && nowMs - a.raisedMs > benchmarks.staleAfterMs);
}

export function topContributors(alarms: AlarmRecord[], n = 10): { source: string; count: number; share: number }[] {
  const counts = new Map<string, number>();
  for (const a of alarms) counts.set(a.source, (counts.get(a.source) ?? 0) + 1);
  return [...counts.entries()]
    .sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))
    .slice(0, n)
    .map(([source, count]) => ({ source, count, share: count / alarms.length }));
}

export function priorityDistribution(alarms: AlarmRecord[]): Record<Priority, number> {
  const d: Record<Priority, number> = { critical: 0, high: 0, medium: 0, low: 0 };
  for (const a of alarms) d[a.priority]++;
  const n = alarms.length || 1;
  for (const k of Object.keys(d) as Priority[]) d[k] /= n;
  return d;
}

function quantile(sorted: number[], q: number): number | null {
  if (sorted.length === 0) return null;
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (pos - lo);
}

export function timeToAcknowledge(alarms: AlarmRecord[]): {
  medianMs: number | null;
  p90Ms: number | null;
  unacknowledged: number;
} {
  const t = alarms
    .filter((a) => a.ackMs != null)
    .map((a) => a.ackMs! - a.raisedMs)
    .sort((a, b) => a - b);
  return { medianMs: quantile(t, 0.5), p90Ms: quantile(t, 0.9), unacknowledged: alarms.length - t.length };
}

export type RateVerdict = 'very likely acceptable' | 'manageable' | 'likely over-demanding';

export function rateVerdict(averagePer10Min: number): RateVerdict {
  if (averagePer10Min <= benchmarks.acceptablePer10Min) return 'very likely acceptable';
  if (averagePer10Min <= benchmarks.manageablePer10Min) return 'manageable';
  return 'likely over-demanding';
}
