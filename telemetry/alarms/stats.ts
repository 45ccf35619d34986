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
  /** recommended share of annunciated alarms by priority (EEMUA 191, approximate) */
  priorityShare: { low: 0.8, medium: 0.15, high: 0.05 },
} as const;

export type AlarmRecord = { source: string; priority: Priority; raisedMs: number; ackMs: number | null; clearedMs: number | null };

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

export function chattering(alarms: AlarmRecord[]): string[] {
  const bySource = new Map<string, number[]>();
  for (const a of alarms) bySource.set(a.source, [...(bySource.get(a.source) ?? []), a.raisedMs]);
  const out: string[] = [];
  for (const [source, times] of bySource) {
    times.sort((x, y) => x - y);
    for (let i = 0; i + benchmarks.chatterCount - 1 < times.length; i++) {
      if (times[i + benchmarks.chatterCount - 1] - times[i] <= benchmarks.chatterWindowMs) {
        out.push(source);
        break;
      }
    }
  }
  return out.sort();
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

export function timeToAcknowledge(alarms: AlarmRecord[]): { medianMs: number | null; p90Ms: number | null; unacknowledged: number } {
  const t = alarms.filter((a) => a.ackMs != null).map((a) => a.ackMs! - a.raisedMs).sort((a, b) => a - b);
  return { medianMs: quantile(t, 0.5), p90Ms: quantile(t, 0.9), unacknowledged: alarms.length - t.length };
}

export type RateVerdict = 'very likely acceptable' | 'manageable' | 'likely over-demanding';

export function rateVerdict(averagePer10Min: number): RateVerdict {
  if (averagePer10Min <= benchmarks.acceptablePer10Min) return 'very likely acceptable';
  if (averagePer10Min <= benchmarks.manageablePer10Min) return 'manageable';
  return 'likely over-demanding';
}
