import { memo } from 'react';
import { VictoryArea, VictoryAxis, VictoryChart, VictoryLine, VictoryZoomContainer } from 'victory';

import { palette } from '@/components/theme/palette';
import { chartPad, font, size } from '@/components/theme/tokens';
import type { ReadingPoint } from '@/telemetry/api';
import { formatClock, formatTime } from '@/telemetry/time';

const axisStyle = {
  tickLabels: { fontFamily: font.regular, fontSize: 14, fill: palette.textMuted },
  axis: { stroke: palette.border },
  grid: { stroke: palette.surfaceMuted },
};

/** VSWR over time with the effective warning and trip lines; min–max band where points are buckets. Never animated. */
export const VswrChart = memo(function VswrChart({
  points,
  width,
  from,
  to,
  warning,
  trip,
  timeZone,
}: {
  points: ReadingPoint[];
  width: number;
  from: number;
  to: number;
  warning: number | null;
  trip: number | null;
  timeZone: string;
}) {
  const long = to - from > 36 * 3_600_000;
  const data = points
    .filter((p) => p.vswr != null)
    .map((p) => ({ x: new Date(p.ts), y: p.vswr!, y0: p.vswrMin ?? p.vswr!, y1: p.vswrMax ?? p.vswr! }));
  const top = Math.max(trip ?? 2, ...data.map((d) => d.y1)) * 1.05;
  const domain = { x: [new Date(from), new Date(to)] as [Date, Date], y: [1, top] as [number, number] };
  return (
    <VictoryChart
      width={width}
      height={size.chartHeight}
      scale={{ x: 'time' }}
      domain={domain}
      padding={chartPad}
      containerComponent={<VictoryZoomContainer zoomDimension="x" />}
    >
      <VictoryAxis
        style={axisStyle}
        tickFormat={(d: Date) =>
          long ? formatTime(d, { timeZone, zoneName: false }).slice(5) : formatClock(d, { timeZone, zoneName: false })
        }
      />
      <VictoryAxis dependentAxis style={axisStyle} tickFormat={(v: number) => v.toFixed(2)} />
      <VictoryArea
        data={data.map((d) => ({ x: d.x, y: d.y1, y0: d.y0 }))}
        style={{ data: { fill: palette.traceMuted, opacity: 0.35 } }}
      />
      <VictoryLine
        data={data.map((d) => ({ x: d.x, y: d.y }))}
        style={{ data: { stroke: palette.trace, strokeWidth: 1.5 } }}
      />
      {warning ? (
        <VictoryLine
          data={[
            { x: domain.x[0], y: warning },
            { x: domain.x[1], y: warning },
          ]}
          style={{ data: { stroke: palette.high, strokeDasharray: '6 4', strokeWidth: 1 } }}
        />
      ) : null}
      {trip ? (
        <VictoryLine
          data={[
            { x: domain.x[0], y: trip },
            { x: domain.x[1], y: trip },
          ]}
          style={{ data: { stroke: palette.critical, strokeDasharray: '6 4', strokeWidth: 1 } }}
        />
      ) : null}
    </VictoryChart>
  );
});
