import { Pressable, type PressableProps, StyleSheet } from 'react-native';

import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';

import { Text } from './text';

type Props = Omit<PressableProps, 'children'> & {
  label: string;
  kind?: 'primary' | 'plain' | 'danger';
  busy?: boolean;
};

export function Button({ label, kind = 'primary', busy, disabled, style, ...rest }: Props) {
  const off = disabled || busy;
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityState={{ disabled: !!off, busy: !!busy }}
      disabled={off}
      {...rest}
      style={(state) => [
        styles.base,
        kind === 'primary' && styles.primary,
        kind === 'danger' && styles.danger,
        off && styles.off,
        (state as { focused?: boolean }).focused && styles.focus,
        typeof style === 'function' ? style(state) : style,
      ]}
    >
      <Text strong style={{ color: kind === 'primary' ? palette.onAccent : palette.text }}>
        {busy ? `${label}…` : label}
      </Text>
    </Pressable>
  );
}

const styles = StyleSheet.create({
  base: {
    maxWidth: size.formMax,
    minHeight: size.touch,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    alignItems: 'center',
    justifyContent: 'center',
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    backgroundColor: palette.surface,
  },
  primary: { backgroundColor: palette.accent, borderColor: palette.accent },
  // a step that cannot be undone: heavy outline and its own words, never an alarm colour
  danger: { backgroundColor: palette.surface, borderColor: palette.text, borderWidth: size.focusWidth - 1 },
  off: { opacity: 0.6 },
  focus: { outlineColor: palette.focus, outlineWidth: size.focusWidth, outlineStyle: 'solid' } as object,
});
