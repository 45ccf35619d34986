import { router } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import {
  useAddAntenna,
  useArchiveAntenna,
  useArchiveSite,
  useFormerControllers,
  useRestoreSite,
  useSites,
  useUpdateAntenna,
  useUpdateSite,
} from '@/components/data/sites';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { Antenna, Site, SiteInput } from '@/telemetry/api';
import { nearest } from '@/telemetry/math/geo';
import { formatTime } from '@/telemetry/time';

import { AntennaForm, protectionWords, serviceWords } from './antenna-form';
import { SiteForm } from './site-form';

function AntennaRow({ site, antenna, writer }: { site: Site; antenna: Antenna; writer: boolean }) {
  const [editing, setEditing] = useState(false);
  const [archiving, setArchiving] = useState(false);
  const [reason, setReason] = useState('');
  const update = useUpdateAntenna(site.id, antenna.id);
  const archive = useArchiveAntenna(site.id);
  if (editing) {
    return (
      <Card tone="muted">
        <AntennaForm
          antenna={antenna}
          submitLabel="Save antenna"
          busy={update.isPending}
          error={update.error}
          onCancel={() => setEditing(false)}
          onSubmit={(v) => update.mutate(v, { onSuccess: () => setEditing(false) })}
        />
      </Card>
    );
  }
  return (
    <View style={{ gap: space.xs }} aria-label={`Antenna ${antenna.name}`}>
      <Text>
        <Text strong>{antenna.name}</Text>: {serviceWords[antenna.service]},{' '}
        {protectionWords[antenna.protection].toLowerCase()}
        {antenna.heaterKw ? ` ${antenna.heaterKw} kW` : ''}
        {antenna.heightM != null ? ` · at ${antenna.heightM} m` : ''}
        {antenna.feedLossDb != null ? ` · feed line ${antenna.feedLossDb} dB` : ''}
        {antenna.archivedAt ? ` · archived ${formatTime(antenna.archivedAt, { timeZone: site.timeZone })}` : ''}
      </Text>
      {writer && !antenna.archivedAt ? (
        archiving ? (
          <View style={{ gap: space.sm }}>
            <TextField
              label={`Why archive ${antenna.name}?`}
              value={reason}
              onChangeText={setReason}
              error={archive.error ? describeError(archive.error) : undefined}
            />
            <View style={{ flexDirection: 'row', gap: space.sm }}>
              <Button
                label="Archive antenna"
                kind="danger"
                busy={archive.isPending}
                onPress={() =>
                  archive.mutate({ antennaId: antenna.id, reason }, { onSuccess: () => setArchiving(false) })
                }
              />
              <Button label="Cancel" kind="plain" onPress={() => setArchiving(false)} />
            </View>
          </View>
        ) : (
          <View style={{ flexDirection: 'row', gap: space.sm }}>
            <Button label="Edit" kind="plain" onPress={() => setEditing(true)} />
            <Button label="Archive" kind="plain" onPress={() => setArchiving(true)} />
          </View>
        )
      ) : null}
    </View>
  );
}

/** The site's details and antennas; engineers edit, add and archive them here. */
export function SiteManage({ site, writer }: { site: Site; writer: boolean }) {
  const [editing, setEditing] = useState(false);
  const [adding, setAdding] = useState(false);
  const [archiving, setArchiving] = useState(false);
  const [reason, setReason] = useState('');
  const update = useUpdateSite(site.id);
  const add = useAddAntenna(site.id);
  const archive = useArchiveSite(site.id);
  const restore = useRestoreSite(site.id);
  const former = useFormerControllers(site.id);
  const all = useSites();
  const near = all.data ? nearest(site, all.data, 3) : [];
  const antennas = site.antennas.filter((a) => !a.archivedAt);
  const archivedAntennas = site.antennas.filter((a) => a.archivedAt);
  return (
    <Card>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}>
        <Text variant="title" role="heading" aria-level={2}>
          Site
        </Text>
        {writer && !editing ? <Button label="Edit site" kind="plain" onPress={() => setEditing(true)} /> : null}
      </View>
      {site.archivedAt ? (
        <Text strong style={{ color: palette.textMuted }}>
          Archived {formatTime(site.archivedAt, { timeZone: site.timeZone })}: off the Board and the lists; its history
          is kept.
        </Text>
      ) : null}
      {editing ? (
        <>
          <SiteForm
            site={site}
            submitLabel="Save site"
            busy={update.isPending}
            error={update.error}
            onSubmit={(v) => update.mutate(v as Partial<SiteInput>, { onSuccess: () => setEditing(false) })}
          />
          <Button label="Cancel" kind="plain" onPress={() => setEditing(false)} />
        </>
      ) : (
        <Text>
          {site.code} · {site.region} · {site.latitude.toFixed(4)}°, {site.longitude.toFixed(4)}° · {site.elevationM} m
          above sea level · tower {site.towerHeightM} m · power {site.powerSource}
          {site.batteryKwh ? `, battery ${site.batteryKwh} kWh` : ''}
          {site.pvKwp ? `, PV ${site.pvKwp} kWp` : ''} · time zone {site.timeZone}
        </Text>
      )}
      {near.length ? (
        <Text variant="small" muted>
          Nearest sites (great circle): {near.map((n) => `${n.site.name} ${n.km.toFixed(0)} km`).join(' · ')}
        </Text>
      ) : null}
      <Text variant="title" role="heading" aria-level={3}>
        Antennas
      </Text>
      {antennas.length === 0 ? <Text muted>No antennas yet.</Text> : null}
      {antennas.map((a) => (
        <AntennaRow key={a.id} site={site} antenna={a} writer={writer} />
      ))}
      {writer && !site.archivedAt ? (
        adding ? (
          <Card tone="muted">
            <AntennaForm
              submitLabel="Add antenna"
              busy={add.isPending}
              error={add.error}
              onCancel={() => setAdding(false)}
              onSubmit={(v) => add.mutate(v, { onSuccess: () => setAdding(false) })}
            />
          </Card>
        ) : (
          <Button label="Add an antenna" kind="plain" onPress={() => setAdding(true)} />
        )
      ) : null}
      {archivedAntennas.length ? (
        <Text variant="small" muted>
          Archived: {archivedAntennas.map((a) => a.name).join(', ')}
        </Text>
      ) : null}
      {former.data?.length ? (
        <View style={{ gap: space.xs }}>
          <Text variant="title" role="heading" aria-level={3}>
            Controllers that were here
          </Text>
          {former.data.map((c) => (
            <Text key={`${c.id}-${c.to}`} variant="small">
              <Text strong variant="small" onPress={() => router.push(`/controllers/${c.id}`)}>
                {c.serial}
              </Text>
              {` until ${c.to ? formatTime(c.to, { timeZone: site.timeZone }) : 'now'}; its readings from then stay with it`}
            </Text>
          ))}
        </View>
      ) : null}
      {writer ? (
        site.archivedAt ? (
          <Button label="Restore site" kind="plain" busy={restore.isPending} onPress={() => restore.mutate()} />
        ) : archiving ? (
          <View style={{ gap: space.sm }}>
            <TextField
              label="Why archive this site?"
              value={reason}
              onChangeText={setReason}
              error={archive.error ? describeError(archive.error) : undefined}
              hint="Its controllers must be moved or decommissioned first. Readings, alarms and visits are kept."
            />
            <View style={{ flexDirection: 'row', gap: space.sm }}>
              <Button
                label="Archive site"
                kind="danger"
                busy={archive.isPending}
                onPress={() => archive.mutate(reason, { onSuccess: () => setArchiving(false) })}
              />
              <Button label="Cancel" kind="plain" onPress={() => setArchiving(false)} />
            </View>
          </View>
        ) : (
          <Button label="Archive site" kind="plain" onPress={() => setArchiving(true)} />
        )
      ) : null}
    </Card>
  );
}
