import { createContext, useContext } from 'react';
import { Text as RNText, type TextProps } from 'react-native';

import { palette } from '@/components/theme/palette';
import { font, type as typeScale } from '@/components/theme/tokens';

type Variant = keyof typeof typeScale;

/** A factor on every text size below it: the wall screen grows its type with the screen. */
export const TypeScale = createContext(1);

export function Text({
  variant = 'body',
  muted,
  strong,
  style,
  ...rest
}: TextProps & { variant?: Variant; muted?: boolean; strong?: boolean }) {
  const k = useContext(TypeScale);
  const base = typeScale[variant];
  return (
    <RNText
      {...rest}
      style={[
        k === 1 ? base : { fontSize: base.fontSize * k, lineHeight: base.lineHeight * k },
        {
          fontFamily: strong || variant === 'heading' || variant === 'title' ? font.semibold : font.regular,
          color: muted ? palette.textMuted : palette.text,
        },
        style,
      ]}
    />
  );
}
