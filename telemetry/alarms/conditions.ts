/** Raw alarm conditions: threshold with deadband, rate of change, absence, combinations. */

export type Direction = 'above' | 'below';

/**
 * Entering needs the limit crossed; leaving needs it crossed back by the deadband
 * (OPC UA Part 9 Annex B deadband), so a value sitting on the limit does not chatter.
 */
export function thresholdCondition(
  value: number | null,
  limit: number,
  direction: Direction,
  deadband: number,
  active: boolean,
): boolean | null {
  if (value == null || !Number.isFinite(value)) return null;
  if (direction === 'above') return active ? value > limit - deadband : value > limit;
  return active ? value < limit + deadband : value < limit;
}

/** Least-squares slope of value per minute over the samples within the window ending now. */
export function ratePerMinute(samples: { tMs: number; v: number }[], windowMs: number, nowMs: number): number | null {
  const pts = samples.filter((s) => s.tMs > nowMs - windowMs && s.tMs <= nowMs && Number.isFinite(s.v));
  if (pts.length < 2) return null;
  const n = pts.length;
  const mt = pts.reduce((a, p) => a + p.tMs, 0) / n;
  const mv = pts.reduce((a, p) => a + p.v, 0) / n;
  let num = 0;
  let den = 0;
  for (const p of pts) {
    num += (p.tMs - mt) * (p.v - mv);
    den += (p.tMs - mt) ** 2;
  }
  return den === 0 ? null : (num / den) * 60_000;
}

/**
 * Adds a sample to a trend kept for rate-of-change rules: one point per second (the
 * newest wins) over the last `windowMs`, so its length stays bounded however often a
 * controller reports or replays. Samples are expected in time order; a late one is kept.
 */
export function addToTrend(trend: { tMs: number; v: number }[], tMs: number, v: number, windowMs: number) {
  const last = trend[trend.length - 1];
  if (last && Math.floor(last.tMs / 1000) === Math.floor(tMs / 1000)) {
    last.tMs = tMs;
    last.v = v;
  } else trend.push({ tMs, v });
  let drop = 0;
  while (drop < trend.length && trend[drop].tMs < tMs - windowMs) drop++;
  if (drop) trend.splice(0, drop);
}

/** True when no reading has come within `intervals` reporting intervals. */
export function silentCondition(
  lastSeenMs: number | null,
  nowMs: number,
  intervalMs: number,
  intervals: number,
): boolean {
  if (lastSeenMs == null) return false; // never seen: the controller is still waiting for its first message
  return nowMs - lastSeenMs > intervalMs * intervals;
}

/** Three-valued AND: false wins, then unknown. */
export function allOf(...c: (boolean | null)[]): boolean | null {
  if (c.some((x) => x === false)) return false;
  return c.some((x) => x == null) ? null : true;
}

export function anyOf(...c: (boolean | null)[]): boolean | null {
  if (c.some((x) => x === true)) return true;
  return c.some((x) => x == null) ? null : false;
}
