import { View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { radius, space } from '@/components/theme/tokens';

import { Text } from './text';

export type Tone = 'neutral' | 'critical' | 'high' | 'medium' | 'low' | 'silent';

const tones: Record<Tone, { fg: string; bg: string }> = {
  neutral: { fg: palette.textMuted, bg: palette.surfaceMuted },
  critical: { fg: palette.critical, bg: palette.criticalBg },
  high: { fg: palette.high, bg: palette.highBg },
  medium: { fg: palette.medium, bg: palette.mediumBg },
  low: { fg: palette.low, bg: palette.lowBg },
  silent: { fg: palette.silent, bg: palette.silentBg },
};

export function Badge({ label, tone = 'neutral' }: { label: string; tone?: Tone }) {
  const t = tones[tone];
  return (
    <View
      style={{
        backgroundColor: t.bg,
        borderRadius: radius.sm,
        paddingHorizontal: space.sm,
        paddingVertical: 2,
        alignSelf: 'flex-start',
      }}
    >
      <Text variant="small" strong style={{ color: t.fg }}>
        {label}
      </Text>
    </View>
  );
}
