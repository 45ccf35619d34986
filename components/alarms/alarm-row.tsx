import { Link } from 'expo-router';
import { memo } from 'react';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { awaitsAck } from '@/telemetry/alarms/machine';
import type { AlarmView, Site } from '@/telemetry/api';
import { formatClock, formatTime } from '@/telemetry/time';

import { kindWords, prioritySign, priorityTone, stateWords } from './words';

export const AlarmRow = memo(function AlarmRow({ a, site }: { a: AlarmView; site?: Site }) {
  const waiting = awaitsAck(a.state);
  return (
    <View role="listitem">
      <Link
        href={`/alarms/${a.id}`}
        style={{ display: 'flex', flexDirection: 'column', width: '100%' }}
        aria-label={`Alarm ${kindWords[a.kind] ?? a.kind} at ${site?.name ?? 'site'}`}
      >
        <Card>
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, alignItems: 'center' }}>
            <Badge label={`${prioritySign(a.priority)} ${a.priority}`} tone={priorityTone(a.priority)} />
            <Badge label={stateWords[a.state] ?? a.state} tone={waiting ? priorityTone(a.priority) : 'neutral'} />
            <Text strong>{kindWords[a.kind] ?? a.kind}</Text>
          </View>
          <Text>
            {site?.name ?? `Site ${a.siteId}`} · {a.message}
          </Text>
          <Text variant="small" muted>
            Raised {formatTime(a.raisedAt, { timeZone: site?.timeZone })}
            {a.ackedAt ? ` · acknowledged ${formatClock(a.ackedAt, { timeZone: site?.timeZone })}` : ''}
          </Text>
        </Card>
      </Link>
    </View>
  );
});
