import { useLocalSearchParams } from 'expo-router';

import { ControllerDetail } from '@/components/controllers/controller-detail';
import { useController } from '@/components/data/controllers';
import { useMe } from '@/components/data/session';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';

export default function ControllerRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const c = useController(Number(id));
  const me = useMe();
  return (
    <Screen title={c.data ? `Controller ${c.data.serial}` : 'Controller'}>
      <QueryState query={c}>{(detail) => (me.data ? <ControllerDetail c={detail} me={me.data} /> : null)}</QueryState>
    </Screen>
  );
}
