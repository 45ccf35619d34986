import { useRouter } from 'expo-router';

import { ControllerList } from '@/components/controllers/controller-list';
import { useControllers } from '@/components/data/controllers';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { Button } from '@/components/ui/button';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';
import { can } from '@/telemetry/roles';

export default function ControllersRoute() {
  const controllers = useControllers();
  const sites = useSites();
  const me = useMe();
  const router = useRouter();
  return (
    <Screen
      title="Controllers"
      actions={
        <>
          {can(me.data?.role, 'controllers.enrol') ? (
            <Button label="Enrol a controller" onPress={() => router.push('/controllers/new')} />
          ) : null}
          {can(me.data?.role, 'controllers.enrol') ? (
            <Button label="Enrol from a file" kind="plain" onPress={() => router.push('/controllers/import')} />
          ) : null}
          <Button label="API and MQTT reference" kind="plain" onPress={() => router.push('/reference')} />
        </>
      }
    >
      <QueryState query={controllers}>
        {(list) => <ControllerList controllers={list} sites={sites.data ?? []} />}
      </QueryState>
    </Screen>
  );
}
