import * as ImagePicker from 'expo-image-picker';
import { Link } from 'expo-router';
import { useState } from 'react';
import { Image, View } from 'react-native';

import { icingWords } from '@/components/board/site-tile';
import { Sparkline } from '@/components/board/sparkline';
import { type AlarmDetail as Detail, useAck, useShelve, useUnshelve } from '@/components/data/alarms';
import { describeError } from '@/components/data/api-client';
import { useBoard } from '@/components/data/board';
import { useSiteLive } from '@/components/data/live';
import { useOpenVisits } from '@/components/data/visits';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { SiteTime } from '@/components/ui/site-time';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { useNow } from '@/components/ui/use-now';
import { onSiteWords } from '@/components/visits/on-site';
import { awaitsAck } from '@/telemetry/alarms/machine';
import type { Person, Site } from '@/telemetry/api';
import { antennaRows, siteCondition } from '@/telemetry/board';
import { vswrWords } from '@/telemetry/math/rf';
import { can } from '@/telemetry/roles';
import { formatTime } from '@/telemetry/time';

import { kindWords, prioritySign, priorityTone, stateWords } from './words';

const shelfHours = [1, 4, 8, 24] as const;

export function AlarmDetail({ a, site, me }: { a: Detail; site?: Site; me: Person }) {
  const open = a.closedAt == null;
  const canAck = open && can(me.role, 'alarms.ack') && awaitsAck(a.state);
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
          <Badge label={`${prioritySign(a.priority)} ${a.priority}`} tone={priorityTone(a.priority)} />
          <Badge label={stateWords[a.state] ?? a.state} />
        </View>
        <Text variant="title">{kindWords[a.kind] ?? a.kind}</Text>
        <Text>
          {site?.name ?? `Site ${a.siteId}`} · {a.message}
        </Text>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, alignItems: 'center' }}>
          <Text variant="small" muted>
            Raised
          </Text>
          <SiteTime variant="small" at={a.raisedAt} timeZone={site?.timeZone} />
        </View>
        <Text variant="small" muted>
          {a.clearedAt ? `Condition cleared ${formatTime(a.clearedAt, { timeZone: site?.timeZone })}` : ''}
          {a.shelvedUntil ? ` · shelved until ${formatTime(a.shelvedUntil, { timeZone: site?.timeZone })}` : ''}
        </Text>
      </Card>
      {a.ackedAt ? <Acknowledged a={a} site={site} /> : null}
      <NowAtSite a={a} site={site} />
      {a.guidance ? (
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            What to do
          </Text>
          <Text>{a.guidance}</Text>
        </Card>
      ) : null}
      {canAck ? <AckForm id={a.id} /> : null}
      {open && can(me.role, 'alarms.shelve') ? <ShelveForm id={a.id} shelved={a.state === 'shelved'} /> : null}
      {a.attachments.length ? (
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            Photos
          </Text>
          {a.attachments.map((x) => (
            <Image
              key={x.id}
              source={{ uri: `/api/alarms/attachments/${x.id}` }}
              style={{ width: size.tileMin, height: size.tileMin * 0.75 }}
              resizeMode="contain"
              accessibilityLabel="Photo from the acknowledgement"
            />
          ))}
        </Card>
      ) : null}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          History
        </Text>
        {a.events.map((e, i) => (
          <Text key={i}>
            {formatTime(e.at, { timeZone: site?.timeZone })}: {e.transition}
            {e.person ? ` by ${e.person}` : ''}
            {e.note ? `: “${e.note}”` : ''}
          </Text>
        ))}
      </Card>
    </View>
  );
}

/** Who acknowledged it and when: the confirmation a technician looks for after pressing Acknowledge. */
function Acknowledged({ a, site }: { a: Detail; site?: Site }) {
  const by = [...a.events].reverse().find((e) => e.transition === 'acknowledged')?.person;
  return (
    <Card>
      <Text role="status" strong style={{ color: palette.ok }}>
        ✓ Acknowledged {formatTime(a.ackedAt!, { timeZone: site?.timeZone })}
        {by ? ` by ${by}` : ''}; everyone watching sees it now.
      </Text>
      {a.ackNote ? <Text>“{a.ackNote}”</Text> : null}
    </Card>
  );
}

/**
 * The alarm's controller as it is now, from /live: its VSWR against the limits in
 * force with a short trend, the site's icing, heater current against rated and who
 * is on site, and the way to the site's page and chart.
 */
function NowAtSite({ a, site }: { a: Detail; site?: Site }) {
  // the snapshot that seeds the live values, for a page opened straight from an e-mail
  useBoard();
  const live = useSiteLive(a.siteId);
  const visits = useOpenVisits();
  const now = useNow();
  const [width, setWidth] = useState(0);
  const controllers = live?.controllers ?? [];
  const mine = controllers.filter((c) => c.id === a.controllerId);
  const row = site ? antennaRows(site.antennas, mine)[0] : undefined;
  const latest = mine[0]?.latest;
  const cond = siteCondition(controllers);
  const here = (visits.data ?? []).filter((v) => v.siteId === a.siteId);
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Now at {site?.name ?? 'the site'}
      </Text>
      <View onLayout={(e) => setWidth(e.nativeEvent.layout.width)} aria-label="Value now">
        <Text>
          VSWR now <Text strong>{latest?.vswr != null ? vswrWords(latest.vswr) : 'no reading yet'}</Text>
          {latest ? ` (${formatTime(latest.ts, { timeZone: site?.timeZone, seconds: true, date: false })})` : ''} ·
          limit {vswrWords(a.limits.warning)} · trip {vswrWords(a.limits.trip)}
        </Text>
        <Sparkline points={row?.trend ?? []} width={width} warning={a.limits.warning} tone={palette.trace} />
      </View>
      <Text variant="small" muted>
        {cond.lastTs
          ? `${icingWords[cond.icing]} · ${cond.airTempC?.toFixed(1) ?? '–'} °C`
          : 'No live reading from the site yet'}
        {row?.heater
          ? ` · heater ${row.heater.on ? 'on' : 'off'}${row.heater.currentA != null ? `, ${row.heater.currentA.toFixed(1)} A` : ''}${row.heater.ratedA != null ? ` of ${row.heater.ratedA.toFixed(1)} A rated` : ''}${row.heater.weak ? ' — not heating' : ''}`
          : ''}
      </Text>
      <Text variant="small" muted>
        {here.length
          ? `On site: ${here.map((v) => onSiteWords(v, site?.timeZone, now)).join('; ')}`
          : 'Nobody is checked in at this site.'}
      </Text>
      <Link href={`/sites/${a.siteId}`}>
        <Text style={{ color: palette.focus }}>Open {site?.name ?? 'the site'} and its chart</Text>
      </Link>
    </Card>
  );
}

function AckForm({ id }: { id: number }) {
  const [note, setNote] = useState('');
  const [photo, setPhoto] = useState<{ uri: string; name: string; type: string } | null>(null);
  const ack = useAck(id);
  const pick = async () => {
    const r = await ImagePicker.launchImageLibraryAsync({ mediaTypes: ['images'], quality: 0.7 });
    const asset = r.canceled ? null : r.assets[0];
    if (asset) setPhoto({ uri: asset.uri, name: asset.fileName ?? 'photo.jpg', type: asset.mimeType ?? 'image/jpeg' });
  };
  const submit = async () => {
    const blob = photo ? await (await fetch(photo.uri)).blob() : null;
    ack.mutate({ note, photo: blob, photoName: photo?.name });
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Acknowledge
      </Text>
      <TextField label="Note" value={note} onChangeText={setNote} multiline placeholder="What you know or are doing" />
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
        <Button kind="plain" label={photo ? 'Change photo' : 'Add a photo'} onPress={() => void pick()} />
        {photo ? (
          <Text variant="small" muted>
            {photo.name}
          </Text>
        ) : null}
      </View>
      {ack.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(ack.error)}
        </Text>
      ) : null}
      <Button label="Acknowledge" busy={ack.isPending} onPress={() => void submit()} />
    </Card>
  );
}

function ShelveForm({ id, shelved }: { id: number; shelved: boolean }) {
  const [reason, setReason] = useState('');
  const [hours, setHours] = useState<(typeof shelfHours)[number]>(4);
  const [error, setError] = useState<string | null>(null);
  const shelve = useShelve(id);
  const unshelve = useUnshelve(id);
  if (shelved) {
    return (
      <Card>
        <Button kind="plain" label="Unshelve now" busy={unshelve.isPending} onPress={() => unshelve.mutate()} />
        <Text variant="small" muted>
          Unshelving by hand returns the alarm to acknowledged; if the shelf simply runs out, a standing alarm comes
          back unacknowledged.
        </Text>
      </Card>
    );
  }
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Shelve
      </Text>
      <TextField label="Reason" value={reason} onChangeText={setReason} error={error ?? undefined} />
      <Choice
        label="For"
        value={hours}
        onChange={setHours}
        options={shelfHours.map((h) => ({ value: h, label: `${h} h` }))}
      />
      {shelve.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(shelve.error)}
        </Text>
      ) : null}
      <Button
        kind="plain"
        label="Shelve"
        busy={shelve.isPending}
        onPress={() => {
          if (reason.trim().length < 3) return setError('Give a reason');
          setError(null);
          shelve.mutate({ reason: reason.trim(), until: new Date(Date.now() + hours * 3_600_000).toISOString() });
        }}
      />
    </Card>
  );
}
