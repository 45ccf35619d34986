import { useState } from 'react';
import { Pressable, View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { useSites } from '@/components/data/sites';
import { useCheckIn, useCheckOut, useHazard, useOpenVisits } from '@/components/data/visits';
import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { CautionHeading } from '@/components/ui/caution';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { useNow } from '@/components/ui/use-now';
import { type Person, safetyChecklistItems, type Site } from '@/telemetry/api';
import { mToFt } from '@/telemetry/math/units';
import { formatClock } from '@/telemetry/time';

import { onSiteWords } from './on-site';

type Item = keyof typeof safetyChecklistItems;

function Check({ label, checked, onChange }: { label: string; checked: boolean; onChange: (v: boolean) => void }) {
  return (
    <Pressable
      role="checkbox"
      aria-checked={checked}
      aria-label={label}
      onPress={() => onChange(!checked)}
      style={{ flexDirection: 'row', gap: space.sm, alignItems: 'center', minHeight: size.touch }}
    >
      <View
        style={{
          width: space.xl,
          height: space.xl,
          borderRadius: radius.sm,
          borderWidth: 2,
          borderColor: palette.accent,
          backgroundColor: checked ? palette.accent : palette.surface,
          alignItems: 'center',
          justifyContent: 'center',
        }}
      >
        {checked ? <Text style={{ color: palette.onAccent }}>✓</Text> : null}
      </View>
      <Text style={{ flexShrink: 1 }}>{label}</Text>
    </Pressable>
  );
}

/** A technician checks in at a site; where ice may fall, the checklist comes first. */
export function CheckIn({ sites, me }: { sites: Site[]; me: Person }) {
  const [siteId, setSiteId] = useState<number | null>(null);
  const [checks, setChecks] = useState<Partial<Record<Item, boolean>>>({});
  const [stay, setStay] = useState(120);
  const hazard = useHazard(siteId);
  const visits = useOpenVisits();
  const checkIn = useCheckIn(siteId);
  const checkOut = useCheckOut();
  const mine = visits.data?.find((v) => v.personId === me.id);
  const site = sites.find((s) => s.id === siteId);
  if (mine) {
    return (
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          You are at {mine.site}
        </Text>
        <Text>
          Checked in {formatClock(mine.checkedInAt, { timeZone: sites.find((x) => x.id === mine.siteId)?.timeZone })}{' '}
          (site time)
          {mine.expectedOutAt
            ? ` · due out ${formatClock(mine.expectedOutAt, { timeZone: sites.find((x) => x.id === mine.siteId)?.timeZone })}`
            : ''}
          {mine.hazard && mine.hazardRadiusM
            ? ` · keep clear of ${mine.hazardRadiusM.toFixed(0)} m around the tower unless you must go in`
            : ''}
        </Text>
        <Button label="Check out" busy={checkOut.isPending} onPress={() => checkOut.mutate(mine.id)} />
      </Card>
    );
  }
  const all = (Object.keys(safetyChecklistItems) as Item[]).every((k) => checks[k]);
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Check in at a site
      </Text>
      <Choice
        label="Site"
        searchLabel="Find a site"
        value={siteId}
        onChange={(s) => {
          setSiteId(s);
          setChecks({});
        }}
        options={sites.map((s) => ({ value: s.id, label: s.name }))}
      />
      {hazard.data?.present && site ? (
        <View style={{ gap: space.sm }} aria-label="Falling ice warning">
          <CautionHeading title={`Ice may fall at ${site.name}`} level={3} />
          <Text>
            {hazard.data.reason}. Screening radius{' '}
            <Text strong>
              {hazard.data.radiusM?.toFixed(0)} m ({mToFt(hazard.data.radiusM ?? 0).toFixed(0)} ft)
            </Text>{' '}
            around the {hazard.data.towerHeightM} m tower, for a {hazard.data.windMs} m/s wind.
          </Text>
          <Text>
            Falling ice can kill. No published tower-specific distance exists: the site’s safety plan, local codes and
            licensed practice decide. Confirm each point:
          </Text>
          {(Object.keys(safetyChecklistItems) as Item[]).map((k) => (
            <Check
              key={k}
              label={safetyChecklistItems[k]}
              checked={!!checks[k]}
              onChange={(v) => setChecks({ ...checks, [k]: v })}
            />
          ))}
        </View>
      ) : siteId ? (
        <Text muted>No ice reported at this site now.</Text>
      ) : null}
      {siteId ? (
        <Choice
          label="Expected to stay"
          value={stay}
          onChange={setStay}
          options={[30, 60, 120, 240, 480].map((m) => ({ value: m, label: m < 60 ? `${m} min` : `${m / 60} h` }))}
        />
      ) : null}
      {checkIn.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(checkIn.error)}
        </Text>
      ) : null}
      {siteId ? (
        <Button
          label="Check in"
          disabled={hazard.isPending || (hazard.data?.present && !all)}
          busy={checkIn.isPending}
          onPress={() => checkIn.mutate({ checklist: checks, stayMinutes: stay })}
        />
      ) : null}
    </Card>
  );
}

export function OnSiteList() {
  const visits = useOpenVisits();
  const now = useNow();
  const sites = useSites();
  const zone = (id: number) => sites.data?.find((s) => s.id === id)?.timeZone;
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        On site now
      </Text>
      {(visits.data ?? []).length === 0 ? (
        <Text muted>Nobody is checked in.</Text>
      ) : (
        visits.data!.map((v) => (
          <Text key={v.id}>
            {onSiteWords(v, zone(v.siteId), now)} at {v.site}, since{' '}
            {formatClock(v.checkedInAt, { timeZone: zone(v.siteId) })} site time
            {v.hazard ? ' · ice hazard confirmed with the checklist' : ''}
          </Text>
        ))
      )}
    </Card>
  );
}
