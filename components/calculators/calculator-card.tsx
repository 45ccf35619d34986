import type { ReactNode } from 'react';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

import type { FieldSpec } from './use-number-form';

type Form<K extends string> = {
  values: Record<K, string>;
  set: (k: K) => (v: string) => void;
  errors: Partial<Record<K, string>>;
};

export function CalculatorCard<K extends string>({
  title,
  fields,
  form,
  children,
  note,
}: {
  title: string;
  fields: Record<K, FieldSpec>;
  form: Form<K>;
  children: ReactNode;
  note?: string;
}) {
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        {title}
      </Text>
      <View style={{ gap: space.sm }}>
        {(Object.keys(fields) as K[]).map((k) => (
          <TextField
            key={k}
            label={fields[k].label}
            unit={fields[k].unit}
            value={form.values[k]}
            onChangeText={form.set(k)}
            inputMode="decimal"
            error={form.errors[k]}
          />
        ))}
      </View>
      <View style={{ gap: space.xs }} aria-live="polite">
        {children}
      </View>
      {note ? (
        <Text variant="small" muted>
          {note}
        </Text>
      ) : null}
    </Card>
  );
}

export function Result({ label, value }: { label: string; value: string }) {
  return (
    <Text>
      <Text strong>{label}: </Text>
      {value}
    </Text>
  );
}
