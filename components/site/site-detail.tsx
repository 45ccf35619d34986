import { View } from 'react-native';
import type { Site } from '../../telemetry/api';
import { space } from '../theme/tokens';
import { Card } from '../ui/screen';
import { Text } from '../ui/text';

const serviceWords = { fm: 'FM', tv: 'TV', microwave: 'Microwave link', satellite: 'Satellite downlink' } as const;
const protectionWords = { heater: 'Electric heater', radome: 'Radome (passive)', blanket: 'Heated blanket', 'gas-heater': 'Gas-fired heater' } as const;

export function SiteDetail({ site }: { site: Site }) {
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <Text variant="title">Where</Text>
        <Text>{site.region} · {site.latitude.toFixed(2)}°, {site.longitude.toFixed(2)}° · {site.elevationM} m above sea level</Text>
        <Text>Tower {site.towerHeightM} m · power {site.powerSource}{site.batteryKwh ? `, battery ${site.batteryKwh} kWh` : ''}</Text>
      </Card>
      <Card>
        <Text variant="title">Antennas</Text>
        {site.antennas.map((a) => (
          <Text key={a.id}>{a.name}: {serviceWords[a.service]}, {protectionWords[a.protection]}{a.heaterKw ? ` ${a.heaterKw} kW` : ''}</Text>
        ))}
      </Card>
    </View>
  );
}
