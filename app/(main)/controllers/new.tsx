import { Link } from 'expo-router';
import { useState } from 'react';

import { CredentialsCard } from '@/components/controllers/credentials-card';
import { EnrolForm } from '@/components/controllers/enrol-form';
import { StatusBadge } from '@/components/controllers/status-badge';
import { useController } from '@/components/data/controllers';
import { useSites } from '@/components/data/sites';
import { QueryState } from '@/components/ui/query-state';
import { Card, Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { ControllerCredentials } from '@/telemetry/api';

export default function EnrolRoute() {
  const sites = useSites();
  const [creds, setCreds] = useState<ControllerCredentials | null>(null);
  return (
    <Screen title="Enrol a controller">
      {creds ? (
        <>
          <CredentialsCard creds={creds} />
          <FirstMessage id={creds.id} />
        </>
      ) : (
        <QueryState query={sites}>{(list) => <EnrolForm sites={list} onEnrolled={setCreds} />}</QueryState>
      )}
    </Screen>
  );
}

function FirstMessage({ id }: { id: number }) {
  const c = useController(id);
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        First telemetry
      </Text>
      {c.data ? <StatusBadge status={c.data.status} /> : null}
      <Text>
        {c.data?.status === 'online'
          ? `Receiving: ${c.data.accepted} ${c.data.accepted === 1 ? 'reading' : 'readings'} so far.`
          : 'Connect the controller with these credentials; this flips to Online when its first reading arrives.'}
      </Text>
      <Link href={`/controllers/${id}`}>
        <Text strong>Open the controller’s page</Text>
      </Link>
    </Card>
  );
}
