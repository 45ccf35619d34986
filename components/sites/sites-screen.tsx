import { Link, router } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';

import { worstBySite } from '@/components/board/board';
import { useAlarms } from '@/components/data/alarms';
import { describeError } from '@/components/data/api-client';
import { useSites } from '@/components/data/sites';
import { NetworkMap } from '@/components/map/network-map';
import { useLayout } from '@/components/theme/breakpoints';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { QueryState } from '@/components/ui/query-state';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { Person, Site } from '@/telemetry/api';
import { can } from '@/telemetry/roles';

import { protectionWords, serviceWords } from './antenna-form';

const powerWords = { utility: 'Mains', solar: 'Solar', generator: 'Generator' } as const;

function SiteRow({ site }: { site: Site }) {
  const antennas = site.antennas.filter((a) => !a.archivedAt);
  return (
    <Link href={`/sites/${site.id}`} style={styles.row} aria-label={`Site ${site.name}`}>
      <View style={{ gap: 2, flexShrink: 1 }}>
        <Text strong>
          {site.name} <Text muted>{site.code}</Text>
        </Text>
        <Text variant="small" muted>
          {antennas.length
            ? antennas
                .map((a) => `${a.name} (${serviceWords[a.service]}, ${protectionWords[a.protection].toLowerCase()})`)
                .join(' · ')
            : 'No antennas yet'}
        </Text>
        <Text variant="small" muted>
          {site.towerHeightM} m tower · {powerWords[site.powerSource]} · {site.timeZone}
        </Text>
      </View>
      {site.archivedAt ? <Badge label="Archived" /> : null}
    </Link>
  );
}

/** Every site on a map and in a list by region; engineers add, import and archive here. */
export function SitesScreen({ me }: { me: Person }) {
  const [archived, setArchived] = useState(false);
  const sites = useSites({ archived });
  const alarms = useAlarms({ open: '1' });
  const { layout } = useLayout();
  const writer = can(me.role, 'sites.write');
  return (
    <View style={{ gap: space.lg }}>
      {writer ? (
        <View style={styles.actions}>
          <Button label="Add a site" onPress={() => router.push('/sites/new')} />
          <Button label="Import sites and antennas" kind="plain" onPress={() => router.push('/sites/import')} />
        </View>
      ) : null}
      <QueryState query={sites}>
        {(list) => (
          <View style={{ gap: space.lg }}>
            <Card>
              <NetworkMap
                sites={list.filter((s) => !s.archivedAt)}
                height={layout === 'phone' ? 300 : layout === 'wall' ? 640 : 460}
                big={layout === 'wall'}
                worst={worstBySite(alarms.data ?? [])}
              />
              <Text variant="small" muted>
                Grey rings: nothing abnormal. A filled mark is coloured as its tile on the Board. Tap a site to open it.
              </Text>
            </Card>
            {[...new Set(list.map((s) => s.region))].map((region) => (
              <View key={region} style={{ gap: space.sm }}>
                <Text variant="title" role="heading" aria-level={2}>
                  {region}
                </Text>
                {list
                  .filter((s) => s.region === region)
                  .map((s) => (
                    <SiteRow key={s.id} site={s} />
                  ))}
              </View>
            ))}
            {list.length === 0 ? (
              <Text muted>No sites yet.{writer ? ' Add one, or import a file of sites and antennas.' : ''}</Text>
            ) : null}
          </View>
        )}
      </QueryState>
      {sites.isError ? <Text role="alert">{describeError(sites.error)}</Text> : null}
      <Pressable role="switch" aria-checked={archived} onPress={() => setArchived(!archived)} style={styles.toggle}>
        <Text>{archived ? '☑' : '☐'} Show archived sites</Text>
      </Pressable>
    </View>
  );
}

const styles = StyleSheet.create({
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  row: {
    flexDirection: 'row',
    justifyContent: 'space-between',
    alignItems: 'center',
    gap: space.md,
    padding: space.md,
    minHeight: size.touch,
    backgroundColor: palette.surface,
    borderRadius: 8,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
  },
  toggle: { minHeight: size.touch, justifyContent: 'center' },
});
