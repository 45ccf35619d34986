import { useQuery } from '@tanstack/react-query';
import type { ReadingPoint } from '../../telemetry/api';
import type { Rule, RuleKind } from '../../telemetry/alarms/rules';
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

/** History for a chart, at most `points` points; the live range refreshes itself. */
export function useHistory(controllerId: number | null, range: RangeKey, points: number) {
  const r = ranges.find((x) => x.key === range)!;
  return useQuery({
    queryKey: keys.readings(controllerId ?? 0, range, points),
    enabled: controllerId != null,
    refetchInterval: range === '15m' ? 5000 : range === '1h' ? 30_000 : false,
    queryFn: async () => {
      const to = new Date();
      const from = new Date(to.getTime() - r.ms);
      const q = new URLSearchParams({ from: from.toISOString(), to: to.toISOString(), points: String(points) });
      return { from: from.getTime(), to: to.getTime(), ...(await api<{ source: string; bucketS?: number; points: ReadingPoint[] }>(`/controllers/${controllerId}/readings?${q}`)) };
    },
  });
}

export function useEffectiveRules(controllerId: number | null) {
  return useQuery({
    queryKey: keys.rules.effective(controllerId ?? 0),
    enabled: controllerId != null,
    queryFn: async () => (await api<{ effective: { kind: RuleKind; rule: Rule | null }[] }>(`/rules/effective?controller=${controllerId}`)).effective,
  });
}
