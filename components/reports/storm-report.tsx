import { Platform, View } from 'react-native';
import { VictoryAxis, VictoryChart, VictoryLine } from 'victory';

import { kindWords } from '@/components/alarms/words';
import { energyWords } from '@/components/data/readings';
import { readingsCsvUrl, stormCsvUrl, type StormReport } from '@/components/data/reports';
import { palette } from '@/components/theme/palette';
import { font, size, space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { formatTime } from '@/telemetry/time';

const h = (x: number) => (x < 1 ? `${Math.round(x * 60)} min` : `${x.toFixed(1)} h`);
const axis = {
  tickLabels: { fontFamily: font.regular, fontSize: 14, fill: palette.textMuted },
  axis: { stroke: palette.border },
};

export function StormReportView({ r, width, canExport }: { r: StormReport; width: number; canExport: boolean }) {
  // every time in the report is the site's own
  const t = (iso: string | null) => (iso ? formatTime(iso, { timeZone: r.site.timeZone }) : '–');
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          {r.site.name}: {t(r.from)} to {t(r.to)}
        </Text>
        <Text>
          Icing conditions from <Text strong>{t(r.icingStart)}</Text> to <Text strong>{t(r.icingEnd)}</Text> · heater
          energy <Text strong>{r.heaterKwh.toFixed(1)} kWh</Text>
        </Text>
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
          {Platform.OS === 'web' ? (
            <a href={stormCsvUrl(r.site.id, r.from, r.to)} download>
              <Text strong>Download CSV</Text>
            </a>
          ) : null}
          {Platform.OS === 'web' && canExport ? (
            <a href={readingsCsvUrl(r.site.id, r.from, r.to)} download>
              <Text strong>All readings (CSV)</Text>
            </a>
          ) : null}
          {Platform.OS === 'web' ? <Button kind="plain" label="Print" onPress={() => window.print()} /> : null}
        </View>
      </Card>
      {r.controllers.map((c) => (
        <Card key={c.id}>
          <Text variant="title" role="heading" aria-level={3}>
            {c.serial}
            {c.antenna ? ` · ${c.antenna}` : ''}
          </Text>
          <Text>
            Peak VSWR <Text strong>{c.peakVswr?.toFixed(2) ?? '–'}</Text> at {t(c.peakAt)} · above warning (
            {c.warning ?? '–'}:1) {h(c.hoursAboveWarning)} · above trip ({c.trip ?? '–'}:1) {h(c.hoursAboveTrip)}
          </Text>
          <Text>
            Heater on {h(c.heaterHours)}
            {c.energy ? ` · ${energyWords(c.energy, c.heaterKw)}` : ''}
            {c.batteryLowPct != null ? ` · battery low point ${c.batteryLowPct.toFixed(0)} %` : ''}
            {c.airTempLowC != null ? ` · coldest ${c.airTempLowC.toFixed(1)} °C` : ''}
          </Text>
          {c.timeline.length > 1 ? (
            <VictoryChart
              width={Math.max(280, width)}
              height={size.chartHeight * 0.7}
              scale={{ x: 'time' }}
              padding={{ top: 8, bottom: 32, left: 52, right: 16 }}
            >
              <VictoryAxis style={axis} />
              <VictoryAxis dependentAxis style={axis} tickFormat={(v: number) => v.toFixed(2)} />
              <VictoryLine
                data={c.timeline.filter((p) => p.vswrMax != null).map((p) => ({ x: new Date(p.ts), y: p.vswrMax! }))}
                style={{ data: { stroke: palette.trace, strokeWidth: 1.5 } }}
              />
              {c.warning ? (
                <VictoryLine
                  data={[
                    { x: new Date(r.from), y: c.warning },
                    { x: new Date(r.to), y: c.warning },
                  ]}
                  style={{ data: { stroke: palette.high, strokeDasharray: '6 4', strokeWidth: 1 } }}
                />
              ) : null}
            </VictoryChart>
          ) : (
            <Text muted>No readings in this range.</Text>
          )}
        </Card>
      ))}
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Alarms ({r.alarms.length})
        </Text>
        {r.alarms.length === 0 ? (
          <Text muted>None in this range.</Text>
        ) : (
          r.alarms.map((a) => (
            <Text key={a.id}>
              {t(a.raisedAt)} · {a.priority} · {kindWords[a.kind] ?? a.kind} ({a.serial}) ·{' '}
              {a.ackedAt
                ? `acknowledged by ${a.ackedBy ?? 'someone'} after ${Math.round((a.secondsToAck ?? 0) / 60)} min`
                : 'not acknowledged'}
            </Text>
          ))
        )}
      </Card>
      <Card>
        <Text variant="title" role="heading" aria-level={2}>
          Heater commands ({r.commands.length})
        </Text>
        {r.commands.length === 0 ? (
          <Text muted>None in this range.</Text>
        ) : (
          r.commands.map((m) => (
            <Text key={m.id}>
              {t(m.sentAt)} · {m.serial} {m.mode} by {m.person ?? '–'}: {m.reason} ·{' '}
              {m.resultOk == null ? 'no answer yet' : m.resultOk ? 'done' : `refused: ${m.resultMessage}`}
            </Text>
          ))
        )}
      </Card>
    </View>
  );
}
