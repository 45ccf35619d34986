import { View } from 'react-native';
import type { Person } from '../../telemetry/api';
import { roleLabels } from '../../telemetry/roles';
import { space } from '../theme/tokens';
import { Badge } from '../ui/badge';
import { Card } from '../ui/screen';
import { Text } from '../ui/text';

export function PeopleList({ people }: { people: Person[] }) {
  return (
    <View style={{ gap: space.sm }} role="list">
      {people.map((p) => (
        <Card key={p.id}>
          <View role="listitem" style={{ gap: space.xs }}>
            <Text strong>{p.name}</Text>
            <Text variant="small" muted>{p.email} · {roleLabels[p.role]}</Text>
            {!p.active ? <Badge label="Deactivated" /> : null}
          </View>
        </Card>
      ))}
    </View>
  );
}
