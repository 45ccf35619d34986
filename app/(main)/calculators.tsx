import { Calculators } from '@/components/calculators/calculators';
import { Screen } from '@/components/ui/screen';

export default function CalculatorsRoute() {
  return (
    <Screen title="Calculators">
      <Calculators />
    </Screen>
  );
}
