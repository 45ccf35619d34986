import { useState } from 'react';
import { View } from 'react-native';

import { useEnergyReport, useHealthReport, useStormReport } from '@/components/data/reports';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { EnergyReportView } from '@/components/reports/energy-report';
import { HealthReportView } from '@/components/reports/health-report';
import { StormReportView } from '@/components/reports/storm-report';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';
import { can } from '@/telemetry/roles';

const spans = [
  { value: 1, label: 'Last 24 h' },
  { value: 3, label: '3 days' },
  { value: 7, label: '7 days' },
  { value: 30, label: '30 days' },
];

export default function ReportsRoute() {
  const [kind, setKind] = useState<'storm' | 'health' | 'energy'>('storm');
  const [days, setDays] = useState(1);
  const [siteId, setSiteId] = useState<number | null>(null);
  const [width, setWidth] = useState(0);
  const sites = useSites();
  const me = useMe();
  // one fixed 'now' per choice, so the queries do not change key on every render
  const [now] = useState(() => Date.now());
  const to = new Date(Math.ceil(now / 60_000) * 60_000).toISOString();
  const from = new Date(Date.parse(to) - days * 86_400_000).toISOString();
  const site = siteId ?? sites.data?.[0]?.id ?? null;
  const storm = useStormReport(kind === 'storm' ? site : null, from, to);
  const health = useHealthReport(from, to);
  const energy = useEnergyReport(from, to);
  return (
    <Screen title="Reports">
      <View onLayout={(e) => setWidth(e.nativeEvent.layout.width - 32)} style={{ gap: 12 }}>
        <Choice
          label="Report"
          value={kind}
          onChange={setKind}
          options={[
            { value: 'storm', label: 'Storm report' },
            { value: 'health', label: 'Alarm health' },
            { value: 'energy', label: 'Energy' },
          ]}
        />
        <Choice label="Range" value={days} onChange={setDays} options={spans} />
        {kind === 'storm' && sites.data ? (
          <Choice
            label="Site"
            searchLabel="Find a site"
            value={site}
            onChange={setSiteId}
            options={sites.data.map((s) => ({ value: s.id, label: s.name }))}
          />
        ) : null}
      </View>
      {kind === 'storm' ? (
        <QueryState query={storm}>
          {(r) => <StormReportView r={r} width={width} canExport={can(me.data?.role, 'exports.read')} />}
        </QueryState>
      ) : null}
      {kind === 'health' ? <QueryState query={health}>{(r) => <HealthReportView r={r} />}</QueryState> : null}
      {kind === 'energy' ? <QueryState query={energy}>{(r) => <EnergyReportView r={r} />}</QueryState> : null}
    </Screen>
  );
}
