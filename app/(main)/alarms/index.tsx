import { useState } from 'react';
import { View } from 'react-native';

import { AlarmList } from '@/components/alarms/alarm-list';
import { AlarmRow } from '@/components/alarms/alarm-row';
import { MyAlerts } from '@/components/alarms/my-alerts';
import { useAlarms } from '@/components/data/alarms';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { space } from '@/components/theme/tokens';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { can } from '@/telemetry/roles';

export default function AlarmsRoute() {
  const [view, setView] = useState<'open' | 'history'>('open');
  const alarms = useAlarms(view === 'open' ? { open: '1' } : {});
  const sites = useSites();
  const me = useMe();
  return (
    <Screen title="Alarms">
      <Choice
        label="Show"
        value={view}
        onChange={setView}
        options={[
          { value: 'open', label: 'Open alarms' },
          { value: 'history', label: 'History' },
        ]}
      />
      <QueryState query={alarms}>
        {(list) =>
          list.length === 0 ? (
            <Text muted>{view === 'open' ? 'No open alarms.' : 'No alarms yet.'}</Text>
          ) : view === 'open' ? (
            <AlarmList alarms={list} sites={sites.data ?? []} canAck={!!me.data && can(me.data.role, 'alarms.ack')} />
          ) : (
            <View style={{ gap: space.sm }} role="list">
              {list.map((a) => (
                <AlarmRow key={a.id} a={a} site={sites.data?.find((s) => s.id === a.siteId)} />
              ))}
            </View>
          )
        }
      </QueryState>
      <MyAlerts />
    </Screen>
  );
}
