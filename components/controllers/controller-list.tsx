import { Link } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';

import { ageWords } from '@/components/board/wall-header';
import { useLayout } from '@/components/theme/breakpoints';
import { size, space } from '@/components/theme/tokens';
import { Card } from '@/components/ui/screen';
import { Table } from '@/components/ui/table';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { useNow } from '@/components/ui/use-now';
import type { Controller, Site } from '@/telemetry/api';

import { StatusBadge } from './status-badge';
import { controllerKindWords } from './words';

const statusOrder = { silent: 0, waiting: 1, online: 2, decommissioned: 3 } as const;

/**
 * Every controller: a sortable table on a wide screen (worst status first until another
 * column is chosen), a list of cards on a phone; a search over serial, site and kind.
 */
export function ControllerList({ controllers, sites }: { controllers: Controller[]; sites: Site[] }) {
  const { layout } = useLayout();
  const now = useNow(30_000);
  const [query, setQuery] = useState('');
  const siteOf = (id: number) => sites.find((s) => s.id === id);
  const siteName = (id: number) => siteOf(id)?.name ?? `site ${id}`;
  if (!controllers.length) return <Text muted>No controllers enrolled yet.</Text>;
  const words = query.toLowerCase().split(/\s+/).filter(Boolean);
  const shown = controllers.filter((c) => {
    const text = `${c.serial} ${siteName(c.siteId)} ${siteOf(c.siteId)?.code ?? ''} ${controllerKindWords[c.kind]} ${c.status}`;
    return words.every((w) => text.toLowerCase().includes(w));
  });
  const lastHeard = (c: Controller) => (c.lastSeenAt ? ageWords(now - Date.parse(c.lastSeenAt)) : 'never');
  return (
    <View style={{ gap: space.sm }}>
      <View style={{ maxWidth: size.formMax }}>
        <TextField
          label="Find a controller"
          value={query}
          onChangeText={setQuery}
          autoCapitalize="none"
          autoCorrect={false}
          placeholder="Serial, site or kind"
        />
      </View>
      <Text variant="small" muted aria-live="polite">
        {shown.length === controllers.length
          ? `${controllers.length} ${controllers.length === 1 ? 'controller' : 'controllers'}`
          : `${shown.length} of ${controllers.length} match`}
      </Text>
      {layout === 'phone' ? (
        <View style={{ gap: space.sm }} role="list">
          {shown.map((c) => (
            <View role="listitem" key={c.id}>
              <Link href={`/controllers/${c.id}`} aria-label={`Controller ${c.serial}`}>
                <Card>
                  <View
                    style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}
                  >
                    <Text strong>{c.serial}</Text>
                    <StatusBadge status={c.status} />
                  </View>
                  <Text variant="small" muted>
                    {siteName(c.siteId)} · {controllerKindWords[c.kind]} · every {c.intervalS} s · last heard{' '}
                    {lastHeard(c)}
                  </Text>
                </Card>
              </Link>
            </View>
          ))}
        </View>
      ) : (
        <Table
          label="Controllers"
          rows={shown}
          rowKey={(c) => c.id}
          rowLabel={(c) => `Controller ${c.serial}`}
          initialSort={{ key: 'status', dir: 'asc' }}
          columns={[
            {
              key: 'serial',
              label: 'Serial',
              sort: (c) => c.serial,
              cell: (c) => (
                <Link href={`/controllers/${c.id}`} aria-label={`Controller ${c.serial}`}>
                  <Text strong>{c.serial}</Text>
                </Link>
              ),
            },
            {
              key: 'site',
              label: 'Site',
              grow: 2,
              sort: (c) => siteName(c.siteId),
              cell: (c) => (
                <Link href={`/sites/${c.siteId}`}>
                  <Text>{siteName(c.siteId)}</Text>
                </Link>
              ),
            },
            {
              key: 'kind',
              label: 'Kind',
              grow: 2,
              sort: (c) => controllerKindWords[c.kind],
              cell: (c) => <Text>{controllerKindWords[c.kind]}</Text>,
            },
            {
              key: 'status',
              label: 'Status',
              sort: (c) => statusOrder[c.status],
              cell: (c) => <StatusBadge status={c.status} />,
            },
            {
              key: 'heard',
              label: 'Last heard',
              // oldest first when ascending: the longest quiet at the top
              sort: (c) => (c.lastSeenAt ? Date.parse(c.lastSeenAt) : null),
              cell: (c) => <Text>{lastHeard(c)}</Text>,
            },
            {
              key: 'interval',
              label: 'Every',
              align: 'right',
              sort: (c) => c.intervalS,
              cell: (c) => <Text>{c.intervalS} s</Text>,
            },
            {
              key: 'accepted',
              label: 'Accepted',
              align: 'right',
              sort: (c) => c.accepted,
              cell: (c) => <Text>{c.accepted.toLocaleString('en-GB')}</Text>,
            },
            {
              key: 'rejected',
              label: 'Rejected',
              align: 'right',
              sort: (c) => c.rejected,
              cell: (c) => <Text>{c.rejected.toLocaleString('en-GB')}</Text>,
            },
          ]}
        />
      )}
    </View>
  );
}
