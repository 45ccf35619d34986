import { Link } from 'expo-router';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { Controller, Site } from '@/telemetry/api';

import { StatusBadge } from './status-badge';
import { controllerKindWords } from './words';

/** A list of cards: reads as a table on a wide screen and as a list on a phone. */
export function ControllerList({ controllers, sites }: { controllers: Controller[]; sites: Site[] }) {
  const siteName = (id: number) => sites.find((s) => s.id === id)?.name ?? `site ${id}`;
  if (!controllers.length) return <Text muted>No controllers enrolled yet.</Text>;
  return (
    <View style={{ gap: space.sm }} role="list">
      {controllers.map((c) => (
        <View role="listitem" key={c.id}>
          <Link href={`/controllers/${c.id}`} aria-label={`Controller ${c.serial}`}>
            <Card>
              <View style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}>
                <Text strong>{c.serial}</Text>
                <StatusBadge status={c.status} />
              </View>
              <Text variant="small" muted>
                {siteName(c.siteId)} · {controllerKindWords[c.kind]} · every {c.intervalS} s · {c.accepted} accepted ·{' '}
                {c.rejected} rejected
              </Text>
            </Card>
          </Link>
        </View>
      ))}
    </View>
  );
}
