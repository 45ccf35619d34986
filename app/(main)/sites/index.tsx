import { useMe } from '@/components/data/session';
import { SitesScreen } from '@/components/sites/sites-screen';
import { Screen } from '@/components/ui/screen';

export default function SitesRoute() {
  const me = useMe();
  return <Screen title="Sites">{me.data ? <SitesScreen me={me.data} /> : null}</Screen>;
}
