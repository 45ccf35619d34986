import { router } from 'expo-router';

import { usePeople } from '@/components/data/people';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { ApiTokensCard } from '@/components/people/api-tokens';
import { OnCallEditor } from '@/components/people/on-call-editor';
import { InviteForm, PeopleList } from '@/components/people/people-list';
import { SettingsCard } from '@/components/people/settings-card';
import { Button } from '@/components/ui/button';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';

export default function PeopleRoute() {
  const people = usePeople();
  const sites = useSites();
  const me = useMe();
  return (
    <Screen
      title="People"
      actions={<Button kind="plain" label="Outbox (development)" onPress={() => router.push('/outbox')} />}
    >
      <InviteForm />
      <SettingsCard />
      <ApiTokensCard />
      <QueryState query={people}>
        {(list) => (
          <>
            {sites.data ? <OnCallEditor sites={sites.data} people={list} /> : null}
            {me.data ? <PeopleList people={list} me={me.data} /> : null}
          </>
        )}
      </QueryState>
    </Screen>
  );
}
