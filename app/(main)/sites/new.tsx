import { router } from 'expo-router';

import { useCreateSite } from '@/components/data/sites';
import { SiteForm } from '@/components/sites/site-form';
import { Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { SiteInput } from '@/telemetry/api';

export default function NewSiteRoute() {
  const create = useCreateSite();
  return (
    <Screen title="Add a site">
      <Text muted>Antennas are added on the site’s page once it exists; integrators then enrol their controllers.</Text>
      <SiteForm
        submitLabel="Add site"
        busy={create.isPending}
        error={create.error}
        onSubmit={(v) => create.mutate(v as SiteInput, { onSuccess: (site) => router.replace(`/sites/${site.id}`) })}
      />
    </Screen>
  );
}
