import { ApiReference } from '@/components/reference/api-reference';
import { Screen } from '@/components/ui/screen';

export default function ReferenceRoute() {
  return (
    <Screen title="API and MQTT reference">
      <ApiReference />
    </Screen>
  );
}
