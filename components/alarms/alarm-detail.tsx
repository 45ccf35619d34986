import * as ImagePicker from 'expo-image-picker';
import { useState } from 'react';
import { Image, View } from 'react-native';

import { type AlarmDetail as Detail, useAck, useShelve, useUnshelve } from '@/components/data/alarms';
import { describeError } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { SiteTime } from '@/components/ui/site-time';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { Person, Site } from '@/telemetry/api';
import { can } from '@/telemetry/roles';
import { formatTime } from '@/telemetry/time';

import { kindWords, priorityTone, stateWords } from './words';

const shelfHours = [1, 4, 8, 24] as const;

export function AlarmDetail({ a, site, me }: { a: Detail; site?: Site; me: Person }) {
  const open = a.closedAt == null;
  const canAck =
    open && can(me.role, 'alarms.ack') && (a.state === 'unacknowledged' || a.state === 'rtn-unacknowledged');
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
          <Badge label={a.priority} tone={priorityTone(a.priority)} />
          <Badge label={stateWords[a.state] ?? a.state} />
        </View>
        <Text variant="title">{kindWords[a.kind] ?? a.kind}</Text>
        <Text>
          {site?.name ?? `Site ${a.siteId}`}: {a.message}
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
        <Text role="alert" style={{ color: palette.critical }}>
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
        <Text role="alert" style={{ color: palette.critical }}>
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
