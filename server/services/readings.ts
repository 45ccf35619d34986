import { notFound } from '@/server/errors';
import type { ControllersRepository } from '@/server/repositories/controllers';
import type { ReadingsRepository } from '@/server/repositories/readings';
import type { Person, ReadingPoint } from '@/telemetry/api';

import type { EnergyService } from './energy';
import type { ScopeGuard } from './scope';

/** Ranges longer than this come from the minute rollups. */
export const rawRangeLimitMs = 6 * 3_600_000;
/** Ranges longer than this come from the hourly rollups (a week of minutes is 10,080 rows per controller). */
export const minuteRangeLimitMs = 7 * 86_400_000;

const num = (v: unknown) => (v == null ? null : Number(v));
const bool = (v: unknown) => (v == null ? null : Boolean(Number(v)));

/** History for charts: never more than `points` points, raw when it fits, min/max buckets otherwise. */
export function readingsService(deps: {
  readings: ReadingsRepository;
  controllers: ControllersRepository;
  guard: ScopeGuard;
  energy: EnergyService;
}) {
  /**
   * Chart answers shared: requests for the same controller, points and aligned window
   * (a wall of screens opening one site after a storm) wait for one query, and its
   * answer serves for a short while: a second for raw readings (the newest arrive over
   * /live anyway), 15 s from the minute table, a minute from the hourly one, whose
   * closed hours never change. Bounded to 500 answers.
   */
  const shared = new Map<string, { until: number; answer: Promise<string> }>();
  // kept as the JSON text sent: fifty screens sharing an answer also share its serialising
  function share(key: string, keepMs: number, run: () => Promise<object>): Promise<string> {
    const now = Date.now();
    const hit = shared.get(key);
    if (hit && now < hit.until) return hit.answer;
    const answer = run().then((x) => JSON.stringify(x));
    answer.catch(() => shared.delete(key));
    shared.set(key, { until: now + keepMs, answer });
    if (shared.size > 500) for (const [k, v] of shared) if (now >= v.until || shared.size > 400) shared.delete(k);
    return answer;
  }
  const align = (t: Date, ms: number, up = false) => new Date((up ? Math.ceil : Math.floor)(t.getTime() / ms) * ms);

  /** Up to `points` raw readings, or min–max buckets of them when there are more. */
  async function rawHistory(controllerId: number, from: Date, to: Date, points: number) {
    const n = await deps.readings.countRaw(controllerId, from, to);
    if (n <= points) {
      const rows = await deps.readings.raw(controllerId, from, to);
      return {
        source: 'raw' as const,
        points: rows.map((r): ReadingPoint => ({
          ts: new Date(r.ts).toISOString(),
          vswr: r.vswr,
          vswrMin: r.vswr,
          vswrMax: r.vswr,
          forwardW: r.forward_w,
          reflectedW: r.reflected_w,
          reflectedMaxW: r.reflected_w,
          airTempC: r.air_temp_c,
          humidityPct: r.humidity_pct,
          moisture: bool(r.moisture),
          heaterOn: Boolean(r.heater_on),
          heaterDuty: r.heater_on ? 1 : 0,
          heaterCurrentA: r.heater_current_a,
          batteryPct: r.battery_pct,
        })),
      };
    }
    const bucketS = Math.ceil(Math.max(1000, to.getTime() - from.getTime()) / 1000 / points);
    return {
      source: 'raw-buckets' as const,
      bucketS,
      points: (await deps.readings.rawBuckets(controllerId, from, to, bucketS)).map(toPoint),
    };
  }

  return {
    /** Heater energy over a window, the same figure the storm and Energy reports give for it. */
    async energy(actor: Person, controllerId: number, q: { from: string; to: string }) {
      await deps.guard.controller(actor, controllerId);
      if (!(await deps.controllers.byId(controllerId))) throw notFound('Controller');
      return deps.energy.window(controllerId, new Date(q.from), new Date(q.to));
    },
    /** A chart's points, as the JSON text of `{ source, bucketS?, points }`. */
    async history(actor: Person, controllerId: number, q: { from?: string; to?: string; points: number }) {
      await deps.guard.controller(actor, controllerId);
      if (!(await deps.controllers.byId(controllerId))) throw notFound('Controller');
      const to = q.to ? new Date(q.to) : new Date();
      const from = q.from ? new Date(q.from) : new Date(to.getTime() - 15 * 60_000);
      const rangeMs = Math.max(1000, to.getTime() - from.getTime());
      if (rangeMs <= rawRangeLimitMs) {
        // whole seconds, so that requests made in the same second share one answer
        const lo = align(from, 1000);
        const hi = align(to, 1000, true);
        return share(`raw:${controllerId}:${q.points}:${+lo}:${+hi}`, 1000, () =>
          rawHistory(controllerId, lo, hi, q.points),
        );
      }
      if (rangeMs <= minuteRangeLimitMs) {
        const bucketS = Math.max(60, Math.ceil(rangeMs / 1000 / q.points / 60) * 60);
        const lo = align(from, bucketS * 1000);
        const hi = align(to, bucketS * 1000, true);
        return share(`min:${controllerId}:${bucketS}:${+lo}:${+hi}`, 15_000, async () => ({
          source: 'rollups' as const,
          bucketS,
          points: (await deps.readings.rollupBuckets(controllerId, lo, hi, bucketS)).map(toPoint),
        }));
      }
      const bucketS = Math.max(3600, Math.ceil(rangeMs / 1000 / q.points / 3600) * 3600);
      // whole buckets, so the first and last of the range are not cut off
      const lo = align(from, bucketS * 1000);
      const hi = align(to, bucketS * 1000, true);
      return share(`hour:${controllerId}:${bucketS}:${+lo}:${+hi}`, 60_000, async () => ({
        source: 'rollups-hour' as const,
        bucketS,
        points: (await deps.readings.rollupBuckets(controllerId, lo, hi, bucketS, 'hour')).map(toPoint),
      }));
    },
  };
}

function toPoint(r: Record<string, unknown>): ReadingPoint {
  const duty = num(r.heater_duty);
  return {
    ts: new Date(r.ts as string).toISOString(),
    vswr: num(r.vswr),
    vswrMin: num(r.vswr_min),
    vswrMax: num(r.vswr_max),
    forwardW: num(r.forward_w),
    reflectedW: num(r.reflected_w),
    reflectedMaxW: num(r.reflected_max),
    airTempC: num(r.air_temp_c),
    humidityPct: num(r.humidity_pct),
    moisture: bool(r.moisture),
    heaterOn: duty == null ? null : duty >= 0.5,
    heaterDuty: duty,
    heaterCurrentA: num(r.heater_current_a),
    batteryPct: num(r.battery_pct),
  };
}
export type ReadingsService = ReturnType<typeof readingsService>;
