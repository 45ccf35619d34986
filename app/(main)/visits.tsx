import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { Screen } from '@/components/ui/screen';
import { CheckIn, OnSiteList } from '@/components/visits/check-in';
import { can } from '@/telemetry/roles';

export default function VisitsRoute() {
  const me = useMe();
  const sites = useSites();
  return (
    <Screen title="Site visits">
      {me.data && sites.data && can(me.data.role, 'visits.write') ? <CheckIn sites={sites.data} me={me.data} /> : null}
      <OnSiteList />
    </Screen>
  );
}
