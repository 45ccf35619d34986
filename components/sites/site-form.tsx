import { useState } from 'react';
import { View } from 'react-native';

import { useRegions } from '@/components/data/sites';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { powerSources, type Site, type SiteInput, siteInputSchema, sitePatchSchema } from '@/telemetry/api';

import { fieldErrors, numberOrNaN, numberOrNull, text } from './form-errors';

const powerWords = { utility: 'Mains', solar: 'Solar', generator: 'Generator' } as const;
const viewerZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';

/**
 * A site's details, for a new site or to change one. Checked here with the same
 * schema the server uses; the server's own field errors land on the same fields.
 */
export function SiteForm({
  site,
  busy,
  error,
  onSubmit,
  submitLabel,
}: {
  site?: Site;
  busy: boolean;
  error: unknown;
  submitLabel: string;
  onSubmit: (v: SiteInput | Partial<SiteInput>) => void;
}) {
  const regions = useRegions();
  const [f, setF] = useState({
    code: site?.code ?? '',
    name: site?.name ?? '',
    region: site?.region ?? '',
    latitude: text(site?.latitude),
    longitude: text(site?.longitude),
    elevationM: text(site?.elevationM),
    towerHeightM: text(site?.towerHeightM),
    batteryKwh: text(site?.batteryKwh),
    pvKwp: text(site?.pvKwp),
    timeZone: site?.timeZone ?? viewerZone(),
  });
  const [power, setPower] = useState<SiteInput['powerSource'] | null>(site?.powerSource ?? null);
  const [local, setLocal] = useState<Record<string, string>>({});
  const errors = { ...(error ? fieldErrors(error) : {}), ...local };
  const set = (k: keyof typeof f) => (v: string) => setF({ ...f, [k]: v });

  const submit = () => {
    const value = {
      code: f.code,
      name: f.name,
      region: f.region,
      latitude: numberOrNaN(f.latitude),
      longitude: numberOrNaN(f.longitude),
      elevationM: numberOrNaN(f.elevationM),
      towerHeightM: numberOrNaN(f.towerHeightM),
      powerSource: power ?? undefined,
      batteryKwh: numberOrNull(f.batteryKwh),
      pvKwp: numberOrNull(f.pvKwp),
      timeZone: f.timeZone,
    };
    const parsed = siteInputSchema.safeParse(value);
    if (!parsed.success) return setLocal(fieldErrors(parsed.error));
    setLocal({});
    if (!site) return onSubmit(parsed.data);
    // only what changed goes to the server, so the audit says what was edited
    const patch = Object.fromEntries(
      Object.entries(parsed.data).filter(([k, v]) => (site as unknown as Record<string, unknown>)[k] !== v),
    );
    if (!Object.keys(patch).length) return setLocal({ '': 'Nothing has changed' });
    onSubmit(sitePatchSchema.parse(patch));
  };

  return (
    <Card>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Code"
            value={f.code}
            onChangeText={set('code')}
            autoCapitalize="characters"
            error={errors.code}
            hint="2–16 letters or digits, unique"
          />
        </View>
        <View style={{ flexBasis: 260, flexGrow: 3 }}>
          <TextField label="Name" value={f.name} onChangeText={set('name')} error={errors.name} />
        </View>
      </View>
      <TextField
        label="Region"
        value={f.region}
        onChangeText={set('region')}
        error={errors.region}
        hint={
          regions.data?.length
            ? `In use: ${regions.data.map((r) => r.name).join(', ')}`
            : 'Sites are grouped by region on the Board'
        }
      />
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Latitude"
            unit="°, north +"
            value={f.latitude}
            onChangeText={set('latitude')}
            inputMode="decimal"
            error={errors.latitude}
          />
        </View>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Longitude"
            unit="°, east +"
            value={f.longitude}
            onChangeText={set('longitude')}
            inputMode="decimal"
            error={errors.longitude}
          />
        </View>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Ground elevation"
            unit="m"
            value={f.elevationM}
            onChangeText={set('elevationM')}
            inputMode="decimal"
            error={errors.elevationM}
          />
        </View>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Tower height"
            unit="m"
            value={f.towerHeightM}
            onChangeText={set('towerHeightM')}
            inputMode="decimal"
            error={errors.towerHeightM}
          />
        </View>
      </View>
      <Choice
        label="Power source"
        value={power}
        onChange={setPower}
        options={powerSources.map((p) => ({ value: p, label: powerWords[p] }))}
        error={errors.powerSource}
      />
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="Battery"
            unit="kWh"
            value={f.batteryKwh}
            onChangeText={set('batteryKwh')}
            inputMode="decimal"
            error={errors.batteryKwh}
            hint="Empty if none"
          />
        </View>
        <View style={{ flexBasis: 140, flexGrow: 1 }}>
          <TextField
            label="PV array"
            unit="kWp"
            value={f.pvKwp}
            onChangeText={set('pvKwp')}
            inputMode="decimal"
            error={errors.pvKwp}
            hint="Empty if none"
          />
        </View>
      </View>
      <TextField
        label="Time zone"
        value={f.timeZone}
        onChangeText={set('timeZone')}
        autoCapitalize="none"
        error={errors.timeZone}
        hint="IANA name, such as Europe/Oslo or America/Anchorage: the site's days, storm windows and times are in it"
      />
      {errors[''] ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {errors['']}
        </Text>
      ) : null}
      <Button label={submitLabel} onPress={submit} busy={busy} />
    </Card>
  );
}
