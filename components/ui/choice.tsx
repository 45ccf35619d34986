import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';

import { pickOptions, shownAtOnce } from './pick-options';
import { Text } from './text';
import { TextField } from './text-field';

/**
 * A labelled group of options, one selected (radio buttons for screen readers and
 * keyboards). With `searchLabel` and more options than fit at once (a network's
 * sites), a search field narrows them and only a handful show.
 */
export function Choice<T extends string | number>({
  label,
  options,
  value,
  onChange,
  error,
  searchLabel,
}: {
  label: string;
  options: { value: T; label: string }[];
  value: T | null;
  onChange: (v: T) => void;
  error?: string;
  searchLabel?: string;
}) {
  const [query, setQuery] = useState('');
  const searchable = !!searchLabel && options.length > shownAtOnce;
  const { shown, matching } = searchable ? pickOptions(options, query, value) : { shown: options, matching: 0 };
  const hidden = matching - Math.min(matching, shownAtOnce);
  return (
    <View style={{ gap: space.xs }} role="radiogroup" aria-label={label}>
      <Text variant="small" strong>
        {label}
      </Text>
      {searchable ? (
        <View style={{ maxWidth: size.formMax, gap: space.xs }}>
          <TextField
            label={searchLabel}
            value={query}
            onChangeText={setQuery}
            autoCorrect={false}
            autoCapitalize="none"
            placeholder="A few letters of the name or code"
          />
          <Text variant="small" muted aria-live="polite">
            {matching === 0
              ? `None of the ${options.length} match “${query}”`
              : hidden > 0
                ? `${matching} of ${options.length} match; ${hidden} more: type to narrow`
                : query
                  ? `${matching} of ${options.length} match`
                  : `All ${options.length}`}
          </Text>
        </View>
      ) : null}
      <View style={styles.row}>
        {shown.map((o) => {
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
