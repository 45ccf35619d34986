import { Outbox } from '@/components/dev/outbox';
import { Screen } from '@/components/ui/screen';

export default function OutboxRoute() {
  return (
    <Screen title="Outbox (development)">
      <Outbox />
    </Screen>
  );
}
