import type { StormReport } from '@/components/data/reports';

/**
 * The storm chart's axes: the storm's own time span (icing, or the trace where
 * icing was not seen) with a margin either side, not the whole range asked for;
 * VSWR from 1.00:1 up past the highest of the peak and the trip level.
 */
export function stormDomain(
  r: Pick<StormReport, 'icingStart' | 'icingEnd'>,
  c: Pick<StormReport['controllers'][number], 'timeline' | 'trip' | 'warning' | 'peakVswr'>,
) {
  const ts = c.timeline.map((p) => Date.parse(p.ts));
  const start = r.icingStart ? Date.parse(r.icingStart) : Math.min(...ts);
  const end = r.icingEnd ? Date.parse(r.icingEnd) : Math.max(...ts);
  const pad = Math.max(10 * 60_000, (end - start) * 0.15);
  const top = Math.max(c.peakVswr ?? 1.2, c.trip ?? 0, c.warning ?? 0);
  return {
    x: [new Date(start - pad), new Date(end + pad)] as [Date, Date],
    y: [1, top + (top - 1) * 0.15] as [number, number],
  };
}
