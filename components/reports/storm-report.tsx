import { Platform, View } from 'react-native';
import { VictoryAxis, VictoryChart, VictoryLine, VictoryScatter } from 'victory';

import { kindWords } from '@/components/alarms/words';
import { energyWords } from '@/components/data/readings';
import { readingsCsvUrl, stormCsvUrl, type StormReport } from '@/components/data/reports';
import { tickWords } from '@/components/site/chart-window';
import { chartAxis } from '@/components/theme/chart';
import { palette, priorityColour } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { Priority } from '@/telemetry/alarms/machine';
import { defaultPriority } from '@/telemetry/alarms/rules';
import { vswrWords } from '@/telemetry/math/rf';
import { formatTime } from '@/telemetry/time';

import { stormDomain } from './storm-domain';

const h = (x: number) => (x < 1 ? `${Math.round(x * 60)} min` : `${x.toFixed(1)} h`);
type Ctl = StormReport['controllers'][number];

/** The storm's trace, its limits and its alarms, on the storm's own span (see `stormDomain`). */
function StormChart({ r, c, width }: { r: StormReport; c: Ctl; width: number }) {
  const steps = c.limitSteps.length ? c.limitSteps : [{ from: r.from, warning: c.warning, trip: c.trip }];
  const highest = (k: 'warning' | 'trip') =>
    steps.reduce<number | null>((m, x) => (x[k] != null && (m == null || x[k]! > m) ? x[k] : m), null);
  const domain = stormDomain(r, { ...c, warning: highest('warning'), trip: highest('trip') });
  const inView = (ms: number) => ms >= domain.x[0].getTime() && ms <= domain.x[1].getTime();
  const trace = c.timeline
    .filter((p) => p.vswrMax != null && inView(Date.parse(p.ts)))
    .map((p) => ({ x: new Date(p.ts), y: p.vswrMax! }));
  // an alarm sits on the trace at the reading nearest its time
  const marks = r.alarms
    .filter((a) => a.serial === c.serial && inView(Date.parse(a.raisedAt)))
    .map((a) => {
      const at = Date.parse(a.raisedAt);
      const near = trace.reduce((b, p) => (Math.abs(+p.x - at) < Math.abs(+b.x - at) ? p : b), trace[0]);
      return { x: new Date(at), y: near?.y ?? domain.y[1], priority: a.priority };
    });
  // each level as it stood: one dashed segment per step of the rules' history
  const levels = (k: 'warning' | 'trip', colour: string) =>
    steps.map((x, i) => {
      const a = Math.max(Date.parse(x.from), domain.x[0].getTime());
      const b = i + 1 < steps.length ? Date.parse(steps[i + 1].from) : domain.x[1].getTime();
      const y = x[k];
      return y == null || b <= a ? null : (
        <VictoryLine
          key={`${k}-${i}`}
          data={[
            { x: new Date(a), y },
            { x: new Date(b), y },
          ]}
          style={{ data: { stroke: colour, strokeDasharray: '6 4', strokeWidth: 1.5 } }}
        />
      );
    });
  // "1.50:1, then from 09:44 CET 1.40:1": only the steps where this level moved
  const stepWords = (k: 'warning' | 'trip') =>
    steps
      .filter((x, i) => i === 0 || x[k] !== steps[i - 1][k])
      .map((x, i) => {
        const level = x[k] == null ? 'none' : vswrWords(x[k]);
        return i ? `from ${formatTime(x.from, { timeZone: r.site.timeZone, date: false })} ${level}` : level;
      })
      .join(', then ');
  return (
    <View aria-label={`VSWR during the storm at ${c.serial}`}>
      <VictoryChart
        width={Math.max(280, width)}
        height={size.chartHeight * 0.7}
        scale={{ x: 'time' }}
        domain={domain}
        padding={{ top: 8, bottom: 32, left: 52, right: 16 }}
      >
        <VictoryAxis
          style={chartAxis}
          tickFormat={tickWords(domain.x[1].getTime() - domain.x[0].getTime(), r.site.timeZone)}
        />
        <VictoryAxis dependentAxis style={chartAxis} tickFormat={(v: number) => v.toFixed(2)} />
        {levels('warning', priorityColour(defaultPriority('vswr-warning')).fg)}
        {levels('trip', priorityColour(defaultPriority('vswr-trip')).fg)}
        <VictoryLine data={trace} style={{ data: { stroke: palette.trace, strokeWidth: 1.5 } }} />
        {marks.length ? (
          <VictoryScatter
            data={marks}
            size={5}
            symbol={({ datum }: { datum?: { priority: string } }) =>
              datum?.priority === 'critical' ? 'triangleUp' : 'diamond'
            }
            style={{
              data: {
                fill: ({ datum }: { datum?: { priority: string } }) =>
                  priorityColour((datum?.priority ?? 'low') as Priority).fg,
              },
            }}
          />
        ) : null}
      </VictoryChart>
      <Text variant="small" muted>
        Times at the site ({r.site.timeZone}). Dashed, as they stood at each moment (from the rules&apos; history):
        warning {stepWords('warning')}; trip {stepWords('trip')}. Markers: alarms raised ({marks.length}).
      </Text>
    </View>
  );
}

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
            <StormChart r={r} c={c} width={width} />
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
