import { View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { chartPad, space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import type { ReadingPoint } from '@/telemetry/api';

/** On/off traces as bands beneath the chart: dark where true, pale where false. */
export function Band({
  label,
  points,
  pick,
  from,
  to,
}: {
  label: string;
  points: ReadingPoint[];
  pick: (p: ReadingPoint) => boolean | null;
  from: number;
  to: number;
}) {
  const span = Math.max(1, to - from);
  const segs: { left: number; width: number; on: boolean }[] = [];
  points.forEach((p, i) => {
    const t = Date.parse(p.ts);
    const next = i + 1 < points.length ? Date.parse(points[i + 1].ts) : to;
    const v = pick(p);
    if (v == null) return;
    segs.push({ left: ((t - from) / span) * 100, width: (Math.max(0, next - t) / span) * 100, on: v });
  });
  const onShare = segs.reduce((a, s) => a + (s.on ? s.width : 0), 0);
  return (
    <View style={{ gap: space.xs }} aria-label={`${label}: ${onShare.toFixed(0)} % of the time`}>
      <Text variant="small" muted>
        {label} · {onShare.toFixed(0)} % of the range
      </Text>
      <SegmentStrip segments={segs.filter((x) => x.on)} colour={palette.trace} />
    </View>
  );
}

/**
 * A strip under a chart, aligned with its plot area, with the given stretches marked
 * (left and width in % of the span). Stretches under a pixel still show.
 */
export function SegmentStrip({ segments, colour }: { segments: { left: number; width: number }[]; colour: string }) {
  return (
    <View
      style={{
        height: space.md,
        marginLeft: chartPad.left,
        marginRight: chartPad.right,
        backgroundColor: palette.surfaceMuted,
        position: 'relative',
        overflow: 'hidden',
        borderRadius: 2,
      }}
    >
      {segments.map((x, i) => (
        <View
          key={i}
          style={{
            position: 'absolute',
            left: `${x.left}%`,
            width: `${Math.max(0.3, x.width)}%`,
            top: 0,
            bottom: 0,
            backgroundColor: colour,
          }}
        />
      ))}
    </View>
  );
}
