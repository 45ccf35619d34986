import { View } from 'react-native';

import { toneColours } from '@/components/theme/palette';
import { radius, space } from '@/components/theme/tokens';

import { Text } from './text';

/**
 * The heading of a danger to people (falling ice, RF, gas, mains): black on safety
 * yellow with the warning sign, the same on every screen that shows it.
 */
export function CautionHeading({ title, level = 2 }: { title: string; level?: number }) {
  const c = toneColours('hazard');
  return (
    <View style={{ backgroundColor: c.bg, borderRadius: radius.sm, paddingHorizontal: space.sm, alignSelf: 'stretch' }}>
      <Text variant="title" role="heading" aria-level={level} style={{ color: c.fg }}>
        ⚠ {title}
      </Text>
    </View>
  );
}
