import { Link } from 'expo-router';
import { View } from 'react-native';

import { kindWords } from '@/components/alarms/words';
import type { HealthReport } from '@/components/data/reports';
import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { formatClock, formatTime } from '@/telemetry/time';

const pct = (x: number) => `${(x * 100).toFixed(0)} %`;

export function HealthReportView({ r }: { r: HealthReport }) {
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Alarm rate
        </Text>
        <Text>
          {r.total} alarms · average <Text strong>{r.averagePer10Min.toFixed(2)}</Text> per 10 minutes · busiest 10
          minutes {r.maxPer10Min}
        </Text>
        <Badge label={r.verdict} tone={r.verdict === 'very likely acceptable' ? 'neutral' : 'advisory'} />
        <Text variant="small" muted>
          ISA-18.2 and EEMUA 191: about {r.benchmarks.acceptablePer10Min} per 10 minutes per operator is very likely
          acceptable, {r.benchmarks.manageablePer10Min} the most that is manageable; more than{' '}
          {r.benchmarks.floodStartsAbovePer10Min} in 10 minutes is a flood. {pct(r.share10MinOverAcceptable)} of
          10-minute periods were above the acceptable rate.
        </Text>
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Floods ({r.floods.length})
        </Text>
        {r.floods.map((f) => (
          <Text key={f.start}>
            {formatTime(f.start)} to {formatClock(f.end)}: {f.count} alarms
          </Text>
        ))}
        <Text variant="title" role="heading" aria-level={2}>
          Chattering ({r.chattering.length}), fleeting ({r.fleeting.length}) and stale ({r.stale.length})
        </Text>
        <Text variant="small" muted>
          Counted per activation, as ISA-18.2 and EEMUA 191 count alarms. Chattering: 3 or more activations within a
          minute; fleeting: back to normal within 5 s (both common practice). Fix these rules first: more on-delay,
          off-delay or deadband.
        </Text>
        {r.chattering.map((c) => (
          <Text key={`c${c.controllerId}${c.kind}`}>
            {kindWords[c.kind] ?? c.kind} at {c.serial}: {c.activations} activations, up to {c.mostInOneMinute} within
            one minute
          </Text>
        ))}
        {r.fleeting.map((c) => (
          <Text key={`f${c.controllerId}${c.kind}`}>
            {kindWords[c.kind] ?? c.kind} at {c.serial}: {c.fleeting} of {c.activations} activations back to normal
            within 5 s
          </Text>
        ))}
        {r.stale.map((c) => (
          <Text key={`s${c.controllerId}${c.kind}${c.raisedAt}`}>
            {kindWords[c.kind] ?? c.kind} at {c.serial}: standing since {formatTime(c.raisedAt)}
          </Text>
        ))}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Top contributors
        </Text>
        {r.top.map((x) => (
          <View key={`${x.kind}${x.controllerId}`} style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
            <Text>
              {kindWords[x.kind] ?? x.kind} at {x.serial}: {x.count} ({pct(x.share)})
            </Text>
            <Link href={`/rules?controller=${x.controllerId}`}>
              <Text strong>Tune the rule</Text>
            </Link>
          </View>
        ))}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Priorities and response
        </Text>
        <Text>
          Critical {pct(r.priorities.critical ?? 0)} · high {pct(r.priorities.high ?? 0)} · medium{' '}
          {pct(r.priorities.medium ?? 0)} · low {pct(r.priorities.low ?? 0)} (EEMUA 191 suggests roughly 5 % high, 15 %
          medium, 80 % low)
        </Text>
        <Text>
          Time to acknowledge: median{' '}
          {r.timeToAck.medianMs != null ? `${Math.round(r.timeToAck.medianMs / 1000)} s` : '–'}, 90th percentile{' '}
          {r.timeToAck.p90Ms != null ? `${Math.round(r.timeToAck.p90Ms / 1000)} s` : '–'} · {r.timeToAck.unacknowledged}{' '}
          never acknowledged
        </Text>
      </Card>
    </View>
  );
}
