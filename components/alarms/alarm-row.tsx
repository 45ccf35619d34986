import { Link } from 'expo-router';
import { memo } from 'react';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { AlarmView, Site } from '@/telemetry/api';
import { formatClock, formatTime } from '@/telemetry/time';

import { kindWords, priorityTone, stateWords } from './words';

export const AlarmRow = memo(function AlarmRow({ a, site }: { a: AlarmView; site?: Site }) {
  const waiting = a.state === 'unacknowledged' || a.state === 'rtn-unacknowledged';
  return (
    <View role="listitem">
      <Link href={`/alarms/${a.id}`} aria-label={`Alarm ${kindWords[a.kind] ?? a.kind} at ${site?.name ?? 'site'}`}>
        <Card>
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, alignItems: 'center' }}>
            <Badge label={a.priority} tone={priorityTone(a.priority)} />
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
