import { memo } from 'react';
import { VictoryArea, VictoryAxis, VictoryChart, VictoryLine, VictorySelectionContainer } from 'victory';

import { chartAxis } from '@/components/theme/chart';
import { palette, priorityColour } from '@/components/theme/palette';
import { chartPad, size } from '@/components/theme/tokens';
import type { Priority } from '@/telemetry/alarms/machine';
import type { ReadingPoint } from '@/telemetry/api';

import { clampZoom, tickWords } from './chart-window';

export type Limit = { level: number; priority: Priority } | null;

/**
 * VSWR over time with the warning and trip lines in force, each in the colour of the
 * priority its alarm raises; a min–max band where points are buckets. Dragging across
 * the chart picks a span to zoom to (`onZoom`); never animated.
 */
export const VswrChart = memo(function VswrChart({
  points,
  width,
  from,
  to,
  warning,
  trip,
  timeZone,
  onZoom,
}: {
  points: ReadingPoint[];
  width: number;
  from: number;
  to: number;
  warning: Limit;
  trip: Limit;
  timeZone: string;
  onZoom?: (span: [number, number]) => void;
}) {
  const data = points
    .filter((p) => p.vswr != null)
    .map((p) => ({ x: new Date(p.ts), y: p.vswr!, y0: p.vswrMin ?? p.vswr!, y1: p.vswrMax ?? p.vswr! }));
  const top = Math.max(trip?.level ?? 2, warning?.level ?? 1.5, ...data.map((d) => d.y1)) * 1.05;
  const domain = { x: [new Date(from), new Date(to)] as [Date, Date], y: [1, top] as [number, number] };
  const line = (l: Limit) =>
    l ? (
      <VictoryLine
        data={[
          { x: domain.x[0], y: l.level },
          { x: domain.x[1], y: l.level },
        ]}
        style={{ data: { stroke: priorityColour(l.priority).fg, strokeDasharray: '6 4', strokeWidth: 1.5 } }}
      />
    ) : null;
  return (
    <VictoryChart
      width={width}
      height={size.chartHeight}
      scale={{ x: 'time' }}
      domain={domain}
      padding={chartPad}
      containerComponent={
        <VictorySelectionContainer
          selectionDimension="x"
          selectionStyle={{ fill: palette.traceMuted, fillOpacity: 0.3, stroke: palette.trace }}
          onSelection={(_points, bounds) => {
            // victory hands the selection's span as { x: [lo, hi], y: [lo, hi] }, whatever its typings say
            const x = (bounds as unknown as { x?: [Date | number, Date | number] }).x;
            if (!onZoom || !x) return;
            const span = clampZoom([Number(x[0]), Number(x[1])], from, to);
            if (span) onZoom(span);
          }}
        />
      }
    >
      <VictoryAxis
        style={chartAxis}
        tickCount={Math.max(2, Math.floor(width / 110))}
        tickFormat={tickWords(to - from, timeZone)}
      />
      <VictoryAxis dependentAxis style={chartAxis} tickFormat={(v: number) => v.toFixed(2)} />
      <VictoryArea
        data={data.map((d) => ({ x: d.x, y: d.y1, y0: d.y0 }))}
        style={{ data: { fill: palette.traceMuted, opacity: 0.35 } }}
      />
      <VictoryLine
        data={data.map((d) => ({ x: d.x, y: d.y }))}
        style={{ data: { stroke: palette.trace, strokeWidth: 1.5 } }}
      />
      {line(warning)}
      {line(trip)}
    </VictoryChart>
  );
});
