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
        {segs
          .filter((s) => s.on)
          .map((s, i) => (
            <View
              key={i}
              style={{
                position: 'absolute',
                left: `${s.left}%`,
                width: `${s.width}%`,
                top: 0,
                bottom: 0,
                backgroundColor: palette.trace,
              }}
            />
          ))}
      </View>
    </View>
  );
}
