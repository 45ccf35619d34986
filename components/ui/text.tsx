import { Text as RNText, type TextProps } from 'react-native';

import { palette } from '@/components/theme/palette';
import { font, type as typeScale } from '@/components/theme/tokens';

type Variant = keyof typeof typeScale;

export function Text({
  variant = 'body',
  muted,
  strong,
  style,
  ...rest
}: TextProps & { variant?: Variant; muted?: boolean; strong?: boolean }) {
  return (
    <RNText
      {...rest}
      style={[
        typeScale[variant],
        {
          fontFamily: strong || variant === 'heading' || variant === 'title' ? font.semibold : font.regular,
          color: muted ? palette.textMuted : palette.text,
        },
        style,
      ]}
    />
  );
}
