import { useSaveSettings, useSettings } from '@/components/data/settings';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';

export function SettingsCard() {
  const settings = useSettings();
  const save = useSaveSettings();
  if (!settings.data) return null;
  const s = settings.data;
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Heater overrides
      </Text>
      <Choice
        label="Operators may force heaters on or off"
        value={s.operatorsMayCommandHeaters ? 'yes' : 'no'}
        onChange={(v) => save.mutate({ ...s, operatorsMayCommandHeaters: v === 'yes' })}
        options={[
          { value: 'no', label: 'Engineers only' },
          { value: 'yes', label: 'Operators too' },
        ]}
      />
    </Card>
  );
}
