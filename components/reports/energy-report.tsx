import { View } from 'react-native';

import type { EnergyReport } from '@/components/data/reports';
import { space } from '@/components/theme/tokens';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';

export function EnergyReportView({ r }: { r: EnergyReport }) {
  const bySite = new Map<string, EnergyReport['daily']>();
  for (const d of r.daily) bySite.set(d.site, [...(bySite.get(d.site) ?? []), d]);
  const total = r.daily.reduce((a, d) => a + d.kwh, 0);
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Heater energy: {total.toFixed(1)} kWh, {r.currency} {(total * r.tariffPerKwh).toFixed(2)} at {r.currency}{' '}
          {r.tariffPerKwh} per kWh
        </Text>
        {[...bySite.entries()].map(([site, days]) => (
          <View key={site} style={{ gap: space.xs }}>
            <Text strong>
              {site}{' '}
              <Text variant="small" muted>
                days in site time ({days[0].timeZone})
              </Text>
            </Text>
            {days.map((d) => (
              <Text key={d.day} variant="small">
                {d.day}: {d.kwh.toFixed(1)} kWh (all heaters
                {d.estimatedKwh > 0
                  ? `; ${d.estimatedKwh.toFixed(1)} of it estimated from ratings where current is not measured`
                  : ', measured'}
                ) · longest-running heater on {d.heaterHours.toFixed(1)} h
                {d.duty != null ? ` · highest duty ${(d.duty * 100).toFixed(0)} %` : ''}
                {d.heaters > 1 ? ` · ${d.heaters} heaters` : ''} · cost {r.currency} {d.cost.toFixed(2)}
              </Text>
            ))}
          </View>
        ))}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Off-grid sites
        </Text>
        {r.offGrid.map((s) => (
          <Text key={s.siteId}>
            {s.name}: battery {s.batteryPct != null ? `${s.batteryPct.toFixed(0)} %` : '–'} of {s.batteryKwh ?? '–'} kWh
            · heating at {s.heaterKw} kW lasts{' '}
            <Text strong>{s.hoursOfHeating != null ? `${s.hoursOfHeating.toFixed(1)} h` : '–'}</Text> ({s.assumptions})
          </Text>
        ))}
      </Card>
    </View>
  );
}
