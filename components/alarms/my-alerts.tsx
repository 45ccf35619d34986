import { usePrefs, useSetPrefs } from '@/components/data/people';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { NotificationPrefs } from '@/telemetry/api';

const levels: (keyof NotificationPrefs)[] = ['critical', 'high', 'medium', 'low'];

/** Each person chooses which priorities reach them by e-mail when they are on call. */
export function MyAlerts() {
  const prefs = usePrefs();
  const save = useSetPrefs();
  if (!prefs.data) return null;
  const p = prefs.data;
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        My e-mail alerts
      </Text>
      {levels.map((k) => (
        <Choice
          key={k}
          label={`${k} alarms`}
          value={p[k] ? 'on' : 'off'}
          onChange={(v) => save.mutate({ ...p, [k]: v === 'on' })}
          options={[
            { value: 'on', label: 'E-mail me' },
            { value: 'off', label: 'No e-mail' },
          ]}
        />
      ))}
    </Card>
  );
}
