import type { Priority } from './machine';

/**
 * The order of the alarm list, built around "what needs me now": priority first
 * (critical at the top), then the longest waiting. A site with a flood of alarms
 * folds its lower-priority ones into one summary, but a summary never hides an
 * alarm that outranks one shown: critical and high alarms are always listed one by
 * one, and nothing is folded above the lowest priority shown elsewhere.
 */
export const floodAt = 5;
const rank: Record<Priority, number> = { critical: 3, high: 2, medium: 1, low: 0 };
/** the highest priority a summary may fold */
const foldAtMost = rank.medium;

export type QueueAlarm = { id: number; siteId: number; priority: Priority; raisedAt: string };
export type QueueEntry<A extends QueueAlarm> =
  { kind: 'alarm'; alarm: A } | { kind: 'summary'; siteId: number; folded: A[]; counts: [Priority, number][] };

const byUrgency = (a: QueueAlarm, b: QueueAlarm) =>
  rank[b.priority] - rank[a.priority] || Date.parse(a.raisedAt) - Date.parse(b.raisedAt) || a.id - b.id;

export function alarmQueue<A extends QueueAlarm>(
  alarms: A[],
  expandedSites: ReadonlySet<number> = new Set(),
): QueueEntry<A>[] {
  const perSite = new Map<number, number>();
  for (const a of alarms) perSite.set(a.siteId, (perSite.get(a.siteId) ?? 0) + 1);
  const flooding = (a: A) => (perSite.get(a.siteId) ?? 0) >= floodAt && !expandedSites.has(a.siteId);
  // fold nothing above the lowest priority that is listed one by one anyway
  const lowestListed = Math.min(foldAtMost, ...alarms.filter((a) => !flooding(a)).map((a) => rank[a.priority]));
  const foldable = (a: A) => flooding(a) && rank[a.priority] <= lowestListed;
  const sorted = [...alarms].sort(byUrgency);
  const folded = new Map<number, A[]>();
  for (const a of sorted) if (foldable(a)) folded.set(a.siteId, [...(folded.get(a.siteId) ?? []), a]);
  // a summary of one alarm says less than the alarm
  const folds = (a: A) => foldable(a) && (folded.get(a.siteId)?.length ?? 0) >= 2;
  const out: QueueEntry<A>[] = [];
  const placed = new Set<number>();
  for (const a of sorted) {
    if (!folds(a)) {
      out.push({ kind: 'alarm', alarm: a });
      continue;
    }
    // the summary stands where its most urgent folded alarm would have stood
    if (placed.has(a.siteId)) continue;
    placed.add(a.siteId);
    const list = folded.get(a.siteId)!;
    const counts = (['critical', 'high', 'medium', 'low'] as const)
      .map((p) => [p, list.filter((x) => x.priority === p).length] as [Priority, number])
      .filter(([, n]) => n > 0);
    out.push({ kind: 'summary', siteId: a.siteId, folded: list, counts });
  }
  return out;
}
