import { useState } from 'react';
import { StyleSheet, TextInput, type TextInputProps, View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { font, radius, size, space, type } from '@/components/theme/tokens';

import { Text } from './text';

type Props = TextInputProps & { label: string; error?: string; unit?: string; hint?: string };

/** A labelled input; the label is tied to the field for screen readers. */
export function TextField({ label, error, unit, hint, style, ...rest }: Props) {
  const [focused, setFocused] = useState(false);
  return (
    <View style={styles.wrap}>
      <Text variant="small" strong>
        {unit ? `${label} (${unit})` : label}
      </Text>
      <TextInput
        aria-label={unit ? `${label} (${unit})` : label}
        accessibilityLabel={unit ? `${label} (${unit})` : label}
        placeholderTextColor={palette.textMuted}
        {...rest}
        onFocus={(e) => {
          setFocused(true);
          rest.onFocus?.(e);
        }}
        onBlur={(e) => {
          setFocused(false);
          rest.onBlur?.(e);
        }}
        style={[styles.input, focused && styles.focused, !!error && styles.invalid, style]}
      />
      {error ? (
        <Text variant="small" style={{ color: palette.invalid }} role="alert">
          {error}
        </Text>
      ) : hint ? (
        <Text variant="small" muted>
          {hint}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  // a field is as wide as what goes in it, not the screen
  wrap: { gap: space.xs, width: '100%', maxWidth: size.formMax },
  input: {
    ...type.body,
    fontFamily: font.regular,
    color: palette.text,
    minHeight: size.touch,
    paddingHorizontal: space.md,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    borderRadius: radius.md,
    backgroundColor: palette.surface,
  },
  focused: {
    borderColor: palette.focus,
    outlineColor: palette.focus,
    outlineWidth: size.focusWidth - 1,
    outlineStyle: 'solid',
  } as object,
  invalid: { borderColor: palette.invalid },
});
