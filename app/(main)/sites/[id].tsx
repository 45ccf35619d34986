import { useLocalSearchParams } from 'expo-router';

import { useMe } from '@/components/data/session';
import { useSite } from '@/components/data/sites';
import { SiteDetail } from '@/components/site/site-detail';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';

export default function SiteRoute() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const site = useSite(Number(id));
  const me = useMe();
  return (
    <Screen title={site.data?.name ?? 'Site'}>
      <QueryState query={site}>{(s) => (me.data ? <SiteDetail site={s} me={me.data} /> : null)}</QueryState>
    </Screen>
  );
}
