import { scaleLinear } from 'd3-scale';
import { line } from 'd3-shape';
import { memo } from 'react';
import Svg, { Line, Path } from 'react-native-svg';

import { palette } from '@/components/theme/palette';
import { size } from '@/components/theme/tokens';
import type { Trend } from '@/telemetry/trend';

/** One SVG path per tile, drawn from the controller's trend ring; the warning level as a faint rule. */
export const Sparkline = memo(function Sparkline({
  points,
  width,
  warning,
  tone,
}: {
  points: Trend;
  width: number;
  warning: number | null;
  tone: string;
}) {
  const h = size.sparkHeight;
  // read straight from the ring (or array): one pass, one path
  const vals: { t: number; v: number }[] = [];
  for (let i = 0; i < points.length; i++) {
    const p = points.at(i);
    if (p && p.v != null) vals.push({ t: p.t, v: p.v });
  }
  if (vals.length < 2 || width <= 0) return <Svg width={width} height={h} />;
  const x = scaleLinear()
    .domain([vals[0].t, vals[vals.length - 1].t])
    .range([1, width - 1]);
  const top = Math.max((warning ?? 1.2) * 1.05, ...vals.map((p) => p.v));
  const y = scaleLinear()
    .domain([1, top])
    .range([h - 2, 2])
    .clamp(true);
  const d =
    line<{ t: number; v: number }>()
      .x((p) => x(p.t))
      .y((p) => y(p.v))(vals) ?? '';
  return (
    <Svg width={width} height={h} accessibilityElementsHidden importantForAccessibility="no-hide-descendants">
      {warning != null ? (
        <Line
          x1={0}
          x2={width}
          y1={y(warning)}
          y2={y(warning)}
          stroke={palette.traceMuted}
          strokeDasharray="3 3"
          strokeWidth={1}
        />
      ) : null}
      <Path d={d} stroke={tone} strokeWidth={1.5} fill="none" />
    </Svg>
  );
});
