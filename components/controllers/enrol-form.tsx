import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { useEnrol } from '@/components/data/controllers';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { controllerCreateSchema, type ControllerCredentials, controllerKinds, type Site } from '@/telemetry/api';

import { controllerKindWords } from './words';

export function EnrolForm({ sites, onEnrolled }: { sites: Site[]; onEnrolled: (c: ControllerCredentials) => void }) {
  const [serial, setSerial] = useState('');
  const [siteId, setSiteId] = useState<number | null>(null);
  const [antennaId, setAntennaId] = useState<number | null>(null);
  const [kind, setKind] = useState<(typeof controllerKinds)[number] | null>(null);
  const [intervalS, setIntervalS] = useState('10');
  const [cal, setCal] = useState({ forwardScale: '1', reflectedScale: '1', lineLossDb: '0' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const enrol = useEnrol();
  const site = sites.find((s) => s.id === siteId);

  const submit = () => {
    const parsed = controllerCreateSchema.safeParse({
      serial,
      siteId: siteId ?? 0,
      antennaId,
      kind: kind ?? undefined,
      intervalS: Number(intervalS),
      calibration: {
        forwardScale: Number(cal.forwardScale),
        reflectedScale: Number(cal.reflectedScale),
        lineLossDb: Number(cal.lineLossDb),
      },
    });
    if (!parsed.success) {
      setErrors(
        Object.fromEntries(
          parsed.error.issues.map((i) => [
            i.path.join('.'),
            i.path[0] === 'siteId' ? 'Choose a site' : i.path[0] === 'kind' ? 'Choose a kind' : i.message,
          ]),
        ),
      );
      return;
    }
    setErrors({});
    enrol.mutate(parsed.data, { onSuccess: onEnrolled });
  };

  return (
    <Card>
      <TextField
        label="Serial"
        value={serial}
        onChangeText={setSerial}
        autoCapitalize="characters"
        error={errors.serial}
        hint="As printed on the controller"
      />
      <Choice
        label="Site"
        searchLabel="Find a site"
        value={siteId}
        onChange={(v) => {
          setSiteId(v);
          setAntennaId(null);
        }}
        options={sites.map((s) => ({ value: s.id, label: `${s.name} (${s.code})` }))}
        error={errors.siteId}
      />
      {site ? (
        <Choice
          label="Antenna"
          value={antennaId}
          onChange={setAntennaId}
          options={site.antennas.map((a) => ({ value: a.id, label: a.name }))}
        />
      ) : null}
      <Choice
        label="Kind"
        value={kind}
        onChange={setKind}
        options={controllerKinds.map((k) => ({ value: k, label: controllerKindWords[k] }))}
        error={errors.kind}
      />
      <TextField
        label="Reporting interval"
        unit="s"
        value={intervalS}
        onChangeText={setIntervalS}
        inputMode="numeric"
        error={errors.intervalS}
      />
      <View style={{ gap: space.sm }}>
        <Text strong>Coupler calibration</Text>
        <TextField
          label="Forward scale factor"
          value={cal.forwardScale}
          onChangeText={(v) => setCal({ ...cal, forwardScale: v })}
          inputMode="decimal"
          error={errors['calibration.forwardScale']}
        />
        <TextField
          label="Reflected scale factor"
          value={cal.reflectedScale}
          onChangeText={(v) => setCal({ ...cal, reflectedScale: v })}
          inputMode="decimal"
          error={errors['calibration.reflectedScale']}
        />
        <TextField
          label="Line loss to the antenna"
          unit="dB"
          value={cal.lineLossDb}
          onChangeText={(v) => setCal({ ...cal, lineLossDb: v })}
          inputMode="decimal"
          error={errors['calibration.lineLossDb']}
        />
      </View>
      {enrol.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(enrol.error)}
        </Text>
      ) : null}
      <Button label="Enrol controller" onPress={submit} busy={enrol.isPending} />
    </Card>
  );
}
