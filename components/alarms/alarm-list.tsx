import { useState } from 'react';
import { View } from 'react-native';
import type { AlarmView, Site } from '../../telemetry/api';
import { space } from '../theme/tokens';
import { Badge } from '../ui/badge';
import { Button } from '../ui/button';
import { Card } from '../ui/screen';
import { Text } from '../ui/text';
import { AlarmRow } from './alarm-row';
import { priorityTone } from './words';

/** A site with this many open alarms shows one storm summary instead of a wall of rows. */
export const stormSummaryAt = 5;

export function AlarmList({ alarms, sites }: { alarms: AlarmView[]; sites: Site[] }) {
  const [expanded, setExpanded] = useState<Set<number>>(new Set());
  const bySite = new Map<number, AlarmView[]>();
  for (const a of alarms) bySite.set(a.siteId, [...(bySite.get(a.siteId) ?? []), a]);
  return (
    <View style={{ gap: space.sm }} role="list">
      {[...bySite.entries()].map(([siteId, list]) => {
        const site = sites.find((s) => s.id === siteId);
        if (list.length < stormSummaryAt || expanded.has(siteId)) return list.map((a) => <AlarmRow key={a.id} a={a} site={site} />);
        const counts = (['critical', 'high', 'medium', 'low'] as const).map((p) => [p, list.filter((a) => a.priority === p).length] as const).filter(([, n]) => n > 0);
        return (
          <View role="listitem" key={`storm-${siteId}`} aria-label={`Storm summary ${site?.name ?? siteId}`}>
            <Card>
              <Text strong>{site?.name ?? `Site ${siteId}`}: {list.length} alarms, first at {new Date(list.at(-1)!.raisedAt).toLocaleTimeString()}</Text>
              <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
                {counts.map(([p, n]) => <Badge key={p} label={`${n} ${p}`} tone={priorityTone(p)} />)}
              </View>
              <Button kind="plain" label="Show each alarm" onPress={() => setExpanded(new Set([...expanded, siteId]))} />
            </Card>
          </View>
        );
      })}
    </View>
  );
}
