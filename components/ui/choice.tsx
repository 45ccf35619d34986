import { Pressable, StyleSheet, View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';

import { Text } from './text';

/** A labelled group of options, one selected (radio buttons for screen readers and keyboards). */
export function Choice<T extends string | number>({
  label,
  options,
  value,
  onChange,
  error,
}: {
  label: string;
  options: { value: T; label: string }[];
  value: T | null;
  onChange: (v: T) => void;
  error?: string;
}) {
  return (
    <View style={{ gap: space.xs }} role="radiogroup" aria-label={label}>
      <Text variant="small" strong>
        {label}
      </Text>
      <View style={styles.row}>
        {options.map((o) => {
          const on = o.value === value;
          return (
            <Pressable
              key={String(o.value)}
              role="radio"
              aria-checked={on}
              onPress={() => onChange(o.value)}
              style={[styles.opt, on && styles.on]}
            >
              <Text style={{ color: on ? palette.onAccent : palette.text }}>{o.label}</Text>
            </Pressable>
          );
        })}
      </View>
      {error ? (
        <Text variant="small" role="alert" style={{ color: palette.invalid }}>
          {error}
        </Text>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
  opt: {
    minHeight: size.touch,
    justifyContent: 'center',
    paddingHorizontal: space.md,
    borderRadius: radius.md,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    backgroundColor: palette.surface,
  },
  on: { backgroundColor: palette.accent, borderColor: palette.accent },
});
