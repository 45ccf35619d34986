import type { ReadingPoint } from '@/telemetry/api';
import type { LiveReading } from '@/telemetry/live';
import { formatTime } from '@/telemetry/time';

/** A live reading as a chart point: one reading, so its min and max are itself. */
export function livePoint(r: LiveReading): ReadingPoint {
  return {
    ts: r.ts,
    vswr: r.vswr,
    vswrMin: r.vswr,
    vswrMax: r.vswr,
    forwardW: r.forwardW,
    reflectedW: r.reflectedW,
    reflectedMaxW: r.reflectedW,
    airTempC: r.airTempC,
    humidityPct: r.humidityPct,
    moisture: r.moisture,
    heaterOn: r.heaterOn,
    heaterDuty: r.heaterOn ? 1 : 0,
    heaterCurrentA: r.heaterCurrentA,
    batteryPct: r.batteryPct,
  };
}

/**
 * The stored history with the readings that arrived over /live since it was fetched:
 * in time order, each instant once (a stored point wins over its live copy), and only
 * what falls in the window [from, to].
 */
export function withLiveTail(history: ReadingPoint[], tail: ReadingPoint[], from: number, to: number): ReadingPoint[] {
  const lastStored = history.length ? Date.parse(history[history.length - 1].ts) : -Infinity;
  const seen = new Set<number>();
  const out: ReadingPoint[] = [];
  for (const p of [...history, ...tail.filter((p) => Date.parse(p.ts) > lastStored)]) {
    const t = Date.parse(p.ts);
    if (t < from || t > to || seen.has(t)) continue;
    seen.add(t);
    out.push(p);
  }
  return out.sort((a, b) => Date.parse(a.ts) - Date.parse(b.ts));
}

/**
 * A span picked by dragging across the chart, kept inside what was fetched and never
 * into the future; too narrow a drag (under 10 s, a click) picks nothing.
 */
export function clampZoom(
  picked: [number, number],
  from: number,
  to: number,
  now: number = Date.now(),
): [number, number] | null {
  const lo = Math.max(from, Math.min(picked[0], picked[1]));
  const hi = Math.min(to, now, Math.max(picked[0], picked[1]));
  return hi - lo >= 10_000 ? [lo, hi] : null;
}

/**
 * One time format on the axis, in the site's zone and 24-hour: "14:05" when the span
 * is within a day and a half, "12-03 14:05" beyond, and seconds when under 5 minutes.
 */
export function tickWords(span: number, timeZone: string) {
  return (d: Date | number) => {
    if (span > 36 * 3_600_000) return formatTime(d, { timeZone, zoneName: false }).slice(5);
    return formatTime(d, { timeZone, date: false, zoneName: false, seconds: span < 5 * 60_000 });
  };
}
