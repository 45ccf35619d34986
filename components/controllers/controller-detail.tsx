import { Link } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import {
  type ControllerDetail as Detail,
  useCalibrate,
  useDecommission,
  useRotatePassword,
  useSetService,
} from '@/components/data/controllers';
import { useHistory } from '@/components/data/readings';
import { useSettings } from '@/components/data/settings';
import { useSites } from '@/components/data/sites';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { calibrationSchema, type ControllerCredentials, type Person } from '@/telemetry/api';
import { can } from '@/telemetry/roles';
import { formatClock, formatTime } from '@/telemetry/time';

import { CredentialsCard } from './credentials-card';
import { HeaterForm } from './heater-form';
import { PlacementCard } from './placement-card';
import { StatusBadge } from './status-badge';
import { controllerKindWords } from './words';

const when = (iso: string | null, timeZone?: string) => (iso ? formatTime(iso, { timeZone }) : 'never');

export function ControllerDetail({ c, me }: { c: Detail; me: Person }) {
  const [creds, setCreds] = useState<ControllerCredentials | null>(null);
  const [confirming, setConfirming] = useState(false);
  const rotate = useRotatePassword(c.id);
  const decommission = useDecommission(c.id);
  const settings = useSettings();
  const sites = useSites({ archived: true });
  const site = sites.data?.find((s) => s.id === c.siteId);
  const antenna = site?.antennas.find((a) => a.id === c.antennaId);
  const mayCommand =
    can(me.role, 'heater.command') || (me.role === 'operator' && !!settings.data?.operatorsMayCommandHeaters);
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
          <Text variant="title">{c.serial}</Text>
          <StatusBadge status={c.status} />
        </View>
        {site ? (
          <Link href={`/sites/${site.id}`}>
            <Text strong>
              {site.name} ({site.code}){antenna ? ` · ${antenna.name}` : ''} · {controllerKindWords[c.kind]}
            </Text>
          </Link>
        ) : null}
        <Text>
          First message: {when(c.firstSeenAt, site?.timeZone)} · last message: {when(c.lastSeenAt, site?.timeZone)}
        </Text>
        <Text>
          {c.accepted} readings accepted · {c.rejected} rejected
          {c.conflicts ? ` · ${c.conflicts} in conflict with stored readings` : ''} · reports every {c.intervalS} s
        </Text>
        {c.boot ? (
          <Text muted>
            Boot {c.boot}
            {c.clockSkewS != null ? ` · clock ${skewWords(c.clockSkewS)}` : ''}
          </Text>
        ) : null}
      </Card>
      {creds && c.status !== 'decommissioned' ? <CredentialsCard creds={creds} /> : null}
      <PlacementCard c={c} me={me} />
      {mayCommand && c.kind !== 'radome-sensor' && c.status !== 'decommissioned' ? (
        <HeaterForm controllerId={c.id} />
      ) : null}
      {can(me.role, 'controllers.calibrate') ? <CalibrationForm c={c} /> : null}
      {can(me.role, 'alarms.service') && c.status !== 'decommissioned' ? <ServiceForm c={c} /> : null}
      <LastReadings id={c.id} />
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Rejected messages
        </Text>
        {c.lastRejects.length === 0 ? (
          <Text muted>None. Every message so far passed validation.</Text>
        ) : (
          c.lastRejects.map((r, i) => (
            <View key={i} style={{ gap: space.xs }}>
              <Text strong>
                {when(r.at)}: {r.reason}
              </Text>
              <Text variant="small" muted selectable numberOfLines={2}>
                {r.payload}
              </Text>
            </View>
          ))
        )}
      </Card>
      {can(me.role, 'controllers.enrol') && c.status !== 'decommissioned' ? (
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            Credentials and service
          </Text>
          <Button
            kind="plain"
            label="Issue a new password"
            busy={rotate.isPending}
            onPress={() => rotate.mutate(undefined, { onSuccess: setCreds })}
          />
          {confirming ? (
            <View style={{ gap: space.sm }}>
              <Text strong>Decommission {c.serial}? The broker refuses it from then on.</Text>
              <View style={{ flexDirection: 'row', gap: space.sm }}>
                <Button
                  kind="danger"
                  label="Decommission"
                  busy={decommission.isPending}
                  onPress={() => decommission.mutate()}
                />
                <Button kind="plain" label="Keep it" onPress={() => setConfirming(false)} />
              </View>
            </View>
          ) : (
            <Button kind="plain" label="Decommission…" onPress={() => setConfirming(true)} />
          )}
          {rotate.isError || decommission.isError ? (
            <Text role="alert" style={{ color: palette.invalid }}>
              {describeError(rotate.error ?? decommission.error)}
            </Text>
          ) : null}
        </Card>
      ) : null}
    </View>
  );
}

function CalibrationForm({ c }: { c: Detail }) {
  const [v, setV] = useState({
    forwardScale: String(c.calibration.forwardScale),
    reflectedScale: String(c.calibration.reflectedScale),
    lineLossDb: String(c.calibration.lineLossDb),
  });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useCalibrate(c.id);
  const submit = () => {
    const parsed = calibrationSchema.safeParse({
      forwardScale: Number(v.forwardScale),
      reflectedScale: Number(v.reflectedScale),
      lineLossDb: Number(v.lineLossDb),
    });
    if (!parsed.success)
      return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    save.mutate(parsed.data);
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Calibration
      </Text>
      <TextField
        label="Forward scale factor"
        value={v.forwardScale}
        onChangeText={(x) => setV({ ...v, forwardScale: x })}
        inputMode="decimal"
        error={errors.forwardScale}
      />
      <TextField
        label="Reflected scale factor"
        value={v.reflectedScale}
        onChangeText={(x) => setV({ ...v, reflectedScale: x })}
        inputMode="decimal"
        error={errors.reflectedScale}
      />
      <TextField
        label="Line loss to the antenna"
        unit="dB"
        value={v.lineLossDb}
        onChangeText={(x) => setV({ ...v, lineLossDb: x })}
        inputMode="decimal"
        error={errors.lineLossDb}
        hint="VSWR is worked out at the antenna: return loss at the coupler minus twice this loss."
      />
      {save.isSuccess ? <Text role="status">Calibration saved; it applies to readings from now on.</Text> : null}
      {save.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(save.error)}
        </Text>
      ) : null}
      <Button label="Save calibration" onPress={submit} busy={save.isPending} />
    </Card>
  );
}

/** Diagnostics: the newest accepted readings as stored (after calibration). */
function LastReadings({ id }: { id: number }) {
  const h = useHistory(id, '15m', 1000, { pollMs: 5000 });
  const rows = (h.data?.points ?? []).slice(-5).reverse();
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Last readings
      </Text>
      {rows.length === 0 ? (
        <Text muted>None in the last 15 minutes.</Text>
      ) : (
        rows.map((p) => (
          <Text key={p.ts} variant="small">
            {formatClock(p.ts)} · forward {p.forwardW?.toFixed(1)} W · reflected {p.reflectedW?.toFixed(2)} W · VSWR{' '}
            {p.vswr?.toFixed(3) ?? '–'} · {p.airTempC?.toFixed(1)} °C · {p.humidityPct?.toFixed(0)} % ·{' '}
            {p.moisture ? 'wet' : 'dry'} · heater {p.heaterOn ? 'on' : 'off'}
            {p.heaterCurrentA != null ? ` ${p.heaterCurrentA.toFixed(1)} A` : ''}
          </Text>
        ))
      )}
    </Card>
  );
}

/** Out of service: its alarms stop (maintenance, a known fault), and say so everywhere. */
function ServiceForm({ c }: { c: Detail }) {
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const set = useSetService(c.id);
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Alarms {c.outOfService ? 'out of service' : 'in service'}
      </Text>
      <TextField label="Reason" value={reason} onChangeText={setReason} error={error ?? undefined} />
      <Button
        kind="plain"
        label={c.outOfService ? 'Return alarms to service' : 'Take alarms out of service'}
        busy={set.isPending}
        onPress={() =>
          reason.trim().length < 3
            ? setError('Give a reason')
            : (setError(null), set.mutate({ outOfService: !c.outOfService, reason: reason.trim() }))
        }
      />
      {set.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(set.error)}
        </Text>
      ) : null}
    </Card>
  );
}

/** "2.1 s ahead of the server", "3 min behind the server": the device clock against the server's. */
function skewWords(s: number): string {
  const a = Math.abs(s);
  if (a < 1) return 'in step with the server';
  const amount =
    a < 120
      ? `${a.toFixed(1)} s`
      : a < 7200
        ? `${Math.round(a / 60)} min`
        : a < 172_800
          ? `${Math.round(a / 3600)} h`
          : `${Math.round(a / 86_400)} days`;
  return `${amount} ${s > 0 ? 'ahead of' : 'behind'} the server`;
}
