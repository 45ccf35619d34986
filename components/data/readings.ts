import { useQuery } from '@tanstack/react-query';

import type { Rule, RuleKind } from '@/telemetry/alarms/rules';
import type { ReadingPoint } from '@/telemetry/api';
import type { HeaterEnergy } from '@/telemetry/math/energy';

import { api } from './api-client';
import { keys } from './query-keys';

export const ranges = [
  { key: '15m', label: '15 min', ms: 15 * 60_000 },
  { key: '1h', label: '1 h', ms: 3_600_000 },
  { key: '6h', label: '6 h', ms: 6 * 3_600_000 },
  { key: '24h', label: '24 h', ms: 86_400_000 },
  { key: '7d', label: '7 days', ms: 7 * 86_400_000 },
  { key: '30d', label: '30 days', ms: 30 * 86_400_000 },
] as const;
export type RangeKey = (typeof ranges)[number]['key'];

/**
 * History for a chart, at most `points` points. `span` (a zoomed window) replaces the
 * range. Live ranges are not polled: the Site chart appends what arrives over /live
 * and fetches again when the link comes back; `pollMs` is for views that show what
 * was stored (after calibration), not what arrived.
 */
export function useHistory(
  controllerId: number | null,
  range: RangeKey,
  points: number,
  { span, pollMs }: { span?: [number, number] | null; pollMs?: number } = {},
) {
  const r = ranges.find((x) => x.key === range)!;
  return useQuery({
    queryKey: [...keys.readings(controllerId ?? 0, range, points), span?.[0] ?? null, span?.[1] ?? null],
    enabled: controllerId != null && span !== null,
    staleTime: span ? Infinity : 0,
    refetchInterval: pollMs ?? false,
    queryFn: async () => {
      const to = span ? new Date(span[1]) : new Date();
      const from = span ? new Date(span[0]) : new Date(to.getTime() - r.ms);
      const q = new URLSearchParams({ from: from.toISOString(), to: to.toISOString(), points: String(points) });
      return {
        from: from.getTime(),
        to: to.getTime(),
        ...(await api<{ source: string; bucketS?: number; points: ReadingPoint[] }>(
          `/controllers/${controllerId}/readings?${q}`,
        )),
      };
    },
  });
}

export function useEffectiveRules(controllerId: number | null) {
  return useQuery({
    queryKey: keys.rules.effective(controllerId ?? 0),
    enabled: controllerId != null,
    queryFn: async () =>
      (await api<{ effective: { kind: RuleKind; rule: Rule | null }[] }>(`/rules/effective?controller=${controllerId}`))
        .effective,
  });
}

export type { HeaterEnergy } from '@/telemetry/math/energy';

/** Heater energy over a window, computed on the server exactly as the reports compute it. Times rounded to the minute. */
export function useEnergy(controllerId: number | null, fromMs: number | null, toMs: number | null) {
  const minute = (t: number) => Math.floor(t / 60_000) * 60_000;
  const from = fromMs == null ? null : minute(fromMs);
  const to = toMs == null ? null : minute(toMs) + 60_000;
  return useQuery({
    queryKey: ['energy', controllerId, from, to],
    enabled: controllerId != null && from != null && to != null && to > from,
    staleTime: 30_000,
    queryFn: async () => {
      const q = new URLSearchParams({ from: new Date(from!).toISOString(), to: new Date(to!).toISOString() });
      return (await api<{ energy: HeaterEnergy | null }>(`/controllers/${controllerId}/energy?${q}`)).energy;
    },
  });
}

/** "3.42 kWh measured", "12.0 kWh estimated from the rating", with gaps said. */
export function energyWords(e: HeaterEnergy | null | undefined, ratedKw: number | null): string {
  if (!e) return '–';
  if (e.basis === 'none') return 'no readings';
  const kwh = (x: number) => `${x.toFixed(x < 10 ? 2 : 1)} kWh`;
  const main =
    e.basis === 'measured'
      ? `${kwh(e.kwh)} measured`
      : e.basis === 'estimated'
        ? ratedKw
          ? `${kwh(e.kwh)} estimated (${ratedKw} kW rating × time on; current not measured)`
          : '– (no current measured and no rating)'
        : `${kwh(e.kwh)} (${kwh(e.measuredKwh)} measured, ${kwh(e.estimatedKwh)} estimated from the rating)`;
  return `${main}${e.gaps ? ` · ${e.gaps} gap${e.gaps > 1 ? 's' : ''} (${e.gapHours.toFixed(1)} h) left out` : ''}`;
}
