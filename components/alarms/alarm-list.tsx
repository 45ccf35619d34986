import { useState } from 'react';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { alarmQueue } from '@/telemetry/alarms/queue';
import type { AlarmView, Site } from '@/telemetry/api';
import { formatClock } from '@/telemetry/time';

import { AlarmRow } from './alarm-row';
import { priorityTone } from './words';

/**
 * Open alarms in the order of the alarm queue (telemetry/alarms/queue): most urgent
 * first; a flooding site's lower-priority alarms fold into one summary that never
 * hides anything outranking what is listed.
 */
export function AlarmList({ alarms, sites }: { alarms: AlarmView[]; sites: Site[] }) {
  const [expanded, setExpanded] = useState<Set<number>>(new Set());
  const name = (siteId: number) => sites.find((s) => s.id === siteId)?.name ?? `Site ${siteId}`;
  return (
    <View style={{ gap: space.sm }} role="list">
      {alarmQueue(alarms, expanded).map((e) => {
        if (e.kind === 'alarm')
          return <AlarmRow key={e.alarm.id} a={e.alarm} site={sites.find((s) => s.id === e.alarm.siteId)} />;
        const first = e.folded.reduce((m, a) => (a.raisedAt < m ? a.raisedAt : m), e.folded[0].raisedAt);
        return (
          <View role="listitem" key={`storm-${e.siteId}`} aria-label={`Storm summary ${name(e.siteId)}`}>
            <Card>
              <Text strong>
                {name(e.siteId)}: {e.folded.length} more alarms, first at {formatClock(first)}
              </Text>
              <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
                {e.counts.map(([p, n]) => (
                  <Badge key={p} label={`${n} ${p}`} tone={priorityTone(p)} />
                ))}
              </View>
              <Button
                kind="plain"
                label="Show each alarm"
                onPress={() => setExpanded(new Set([...expanded, e.siteId]))}
              />
            </Card>
          </View>
        );
      })}
    </View>
  );
}
