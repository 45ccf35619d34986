import { useLocalSearchParams } from 'expo-router';

import { AlarmDetail } from '@/components/alarms/alarm-detail';
import { useAlarm } from '@/components/data/alarms';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';

export default function AlarmRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const alarm = useAlarm(Number(id));
  const sites = useSites();
  const me = useMe();
  return (
    <Screen title="Alarm">
      <QueryState query={alarm}>
        {(a) => (me.data ? <AlarmDetail a={a} site={sites.data?.find((s) => s.id === a.siteId)} me={me.data} /> : null)}
      </QueryState>
    </Screen>
  );
}
