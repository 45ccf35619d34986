import { View } from 'react-native';

import { type Tone, toneColours } from '@/components/theme/palette';
import { radius, space } from '@/components/theme/tokens';

import { Text } from './text';

export type { Tone } from '@/components/theme/palette';

export function Badge({ label, tone = 'neutral' }: { label: string; tone?: Tone }) {
  const t = toneColours(tone);
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
