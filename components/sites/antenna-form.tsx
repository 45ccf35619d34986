import { useState } from 'react';
import { View } from 'react-native';

import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { type Antenna, type AntennaInput, antennaInputSchema, protections, services } from '@/telemetry/api';

import { fieldErrors, numberOrNull, text } from './form-errors';

export const serviceWords = { fm: 'FM', tv: 'TV', microwave: 'Microwave', satellite: 'Satellite' } as const;
export const protectionWords = {
  heater: 'Heater',
  radome: 'Radome',
  blanket: 'Heated blanket',
  'gas-heater': 'Gas heater',
} as const;

/** An antenna's details; the rating is asked for only where the protection is electric. */
export function AntennaForm({
  antenna,
  busy,
  error,
  submitLabel,
  onSubmit,
  onCancel,
}: {
  antenna?: Antenna;
  busy: boolean;
  error: unknown;
  submitLabel: string;
  onSubmit: (v: AntennaInput) => void;
  onCancel?: () => void;
}) {
  const [name, setName] = useState(antenna?.name ?? '');
  const [service, setService] = useState<AntennaInput['service'] | null>(antenna?.service ?? null);
  const [protection, setProtection] = useState<AntennaInput['protection'] | null>(antenna?.protection ?? null);
  const [phases, setPhases] = useState<1 | 3>(antenna?.heaterPhases ?? 1);
  const [n, setN] = useState({
    heaterKw: text(antenna?.heaterKw),
    heightM: text(antenna?.heightM),
    feedLossDb: text(antenna?.feedLossDb),
  });
  const [local, setLocal] = useState<Record<string, string>>({});
  const errors = { ...(error ? fieldErrors(error) : {}), ...local };
  const rated = protection === 'heater' || protection === 'blanket';

  const submit = () => {
    const parsed = antennaInputSchema.safeParse({
      name,
      service: service ?? undefined,
      protection: protection ?? undefined,
      heaterKw: rated ? numberOrNull(n.heaterKw) : null,
      heaterPhases: phases,
      heightM: numberOrNull(n.heightM),
      feedLossDb: numberOrNull(n.feedLossDb),
    });
    if (!parsed.success) return setLocal(fieldErrors(parsed.error));
    setLocal({});
    onSubmit(parsed.data);
  };

  return (
    <View style={{ gap: space.md }}>
      <TextField label="Antenna name" value={name} onChangeText={setName} error={errors.name} />
      <Choice
        label="Service"
        value={service}
        onChange={setService}
        options={services.map((s) => ({ value: s, label: serviceWords[s] }))}
        error={errors.service}
      />
      <Choice
        label="Ice protection"
        value={protection}
        onChange={setProtection}
        options={protections.map((p) => ({ value: p, label: protectionWords[p] }))}
        error={errors.protection}
      />
      {rated ? (
        <Choice
          label="Heater supply"
          value={phases}
          onChange={setPhases}
          error={errors.heaterPhases}
          options={[
            { value: 1, label: 'Single-phase (P = V·I)' },
            { value: 3, label: 'Three-phase, balanced (P = √3·V·I)' },
          ]}
        />
      ) : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        {rated ? (
          <View style={{ flexBasis: 140, flexGrow: 1 }}>
            <TextField
              label="Heater rating"
              unit="kW"
              value={n.heaterKw}
              onChangeText={(v) => setN({ ...n, heaterKw: v })}
              inputMode="decimal"
              error={errors.heaterKw}
            />
          </View>
        ) : null}
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Height on the tower"
            unit="m"
            value={n.heightM}
            onChangeText={(v) => setN({ ...n, heightM: v })}
            inputMode="decimal"
            error={errors.heightM}
          />
        </View>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Feed-line loss"
            unit="dB"
            value={n.feedLossDb}
            onChangeText={(v) => setN({ ...n, feedLossDb: v })}
            inputMode="decimal"
            error={errors.feedLossDb}
          />
        </View>
      </View>
      {errors[''] ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {errors['']}
        </Text>
      ) : null}
      <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>
        <Button label={submitLabel} onPress={submit} busy={busy} />
        {onCancel ? <Button label="Cancel" kind="plain" onPress={onCancel} /> : null}
      </View>
    </View>
  );
}
