import { View } from 'react-native';
import { VictoryArea, VictoryAxis, VictoryChart, VictoryLine } from 'victory';

import type { Preview, PreviewSpan } from '@/components/data/rules';
import { SegmentStrip } from '@/components/site/bands';
import { tickWords } from '@/components/site/chart-window';
import { chartAxis } from '@/components/theme/chart';
import { palette } from '@/components/theme/palette';
import { chartPad, size, space } from '@/components/theme/tokens';
import { Table } from '@/components/ui/table';
import { Text } from '@/components/ui/text';
import { durationWords } from '@/telemetry/health';
import { formatTime } from '@/telemetry/time';

type Row = PreviewSpan & { which: 'In force' | 'Proposed'; n: number };

/**
 * The replay drawn: the value the rule watches, the level of the rule in force (dashed)
 * and of the proposed settings (solid), and beneath it one strip per setting with the
 * spans each would have been in alarm; then the would-be alarms as a table.
 */
export function PreviewChart({
  p,
  width,
  unit,
  timeZone,
  wide,
}: {
  p: Preview;
  width: number;
  unit: string;
  timeZone?: string;
  wide: boolean;
}) {
  const from = Date.parse(p.from);
  const to = Date.parse(p.to);
  const span = Math.max(1, to - from);
  const values = p.trace.flatMap((t) => [t.min, t.max]);
  const levels = [p.levels.current, p.levels.proposed].filter((l): l is number => l != null);
  const lo = Math.min(...values, ...levels);
  const hi = Math.max(...values, ...levels);
  const pad = (hi - lo) * 0.08 || Math.abs(hi) * 0.05 || 1;
  const domain = { x: [new Date(from), new Date(to)] as [Date, Date], y: [lo - pad, hi + pad] as [number, number] };
  const fmt = (v: number | null) => (v == null ? '–' : `${v.toFixed(Math.abs(v) < 10 ? 2 : 0)}${unit}`);
  const level = (y: number | null, dashed: boolean) =>
    y == null ? null : (
      <VictoryLine
        data={[
          { x: domain.x[0], y },
          { x: domain.x[1], y },
        ]}
        style={{
          data: {
            stroke: dashed ? palette.textMuted : palette.accent,
            strokeDasharray: dashed ? '6 4' : undefined,
            strokeWidth: dashed ? 1.5 : 2,
          },
        }}
      />
    );
  const rows: Row[] = [
    ...p.spans.current.map((x, i) => ({ ...x, which: 'In force' as const, n: i + 1 })),
    ...p.spans.proposed.map((x, i) => ({ ...x, which: 'Proposed' as const, n: i + 1 })),
  ];
  const when = (t: string) => formatTime(t, { timeZone, seconds: true });
  return (
    <View style={{ gap: space.sm }}>
      <View aria-label="Replayed trace">
        {p.trace.length ? (
          <VictoryChart
            width={Math.max(280, width)}
            height={size.chartHeight * 0.8}
            scale={{ x: 'time' }}
            domain={domain}
            padding={chartPad}
          >
            <VictoryAxis
              style={chartAxis}
              tickCount={Math.max(2, Math.floor(width / 120))}
              tickFormat={tickWords(span, timeZone ?? 'UTC')}
            />
            <VictoryAxis dependentAxis style={chartAxis} tickFormat={(v: number) => fmt(v)} />
            <VictoryArea
              data={p.trace.map((t) => ({ x: new Date(t.ts), y: t.max, y0: t.min }))}
              style={{ data: { fill: palette.traceMuted, opacity: 0.5 } }}
            />
            <VictoryLine
              data={p.trace.map((t) => ({ x: new Date(t.ts), y: t.max }))}
              style={{ data: { stroke: palette.trace, strokeWidth: 1.5 } }}
            />
            {level(p.levels.current, true)}
            {level(p.levels.proposed, false)}
          </VictoryChart>
        ) : (
          <Text muted>No values to draw in this span.</Text>
        )}
      </View>
      <Text variant="small" muted>
        Dashed: the rule in force{p.levels.current != null ? ` (${fmt(p.levels.current)})` : ''}. Solid: these settings
        {p.levels.proposed != null ? ` (${fmt(p.levels.proposed)})` : ''}. Strips: when each would have been in alarm.
      </Text>
      <SpanStrip label="In force" spans={p.spans.current} from={from} span={span} dashed />
      <SpanStrip label="Proposed" spans={p.spans.proposed} from={from} span={span} />
      {rows.length ? (
        wide ? (
          <Table
            label="Would-be alarms"
            rows={rows}
            rowKey={(r) => `${r.which}-${r.n}`}
            initialSort={{ key: 'raised', dir: 'asc' }}
            columns={[
              { key: 'which', label: 'Settings', sort: (r) => r.which, cell: (r) => <Text>{r.which}</Text> },
              {
                key: 'raised',
                label: 'Raised',
                grow: 2,
                sort: (r) => r.from,
                cell: (r) => <Text>{when(r.from)}</Text>,
              },
              {
                key: 'returned',
                label: 'Returned to normal',
                grow: 2,
                sort: (r) => r.to,
                cell: (r) => <Text>{r.to ? when(r.to) : 'still in alarm at the end'}</Text>,
              },
              {
                key: 'lasted',
                label: 'Lasted',
                align: 'right',
                sort: (r) => (r.to ? Date.parse(r.to) : to) - Date.parse(r.from),
                cell: (r) => <Text>{durationWords((r.to ? Date.parse(r.to) : to) - Date.parse(r.from))}</Text>,
              },
              {
                key: 'worst',
                label: 'Worst',
                align: 'right',
                sort: (r) => r.worst,
                cell: (r) => <Text>{fmt(r.worst)}</Text>,
              },
            ]}
          />
        ) : (
          <View role="list" aria-label="Would-be alarms" style={{ gap: space.xs }}>
            {rows.map((r) => (
              <Text key={`${r.which}-${r.n}`} role="listitem">
                <Text strong>{r.which}</Text> · {when(r.from)} → {r.to ? when(r.to) : 'still in alarm'} · worst{' '}
                {fmt(r.worst)}
              </Text>
            ))}
          </View>
        )
      ) : (
        <Text>Neither would have raised an alarm over this span.</Text>
      )}
    </View>
  );
}

function SpanStrip({
  label,
  spans,
  from,
  span,
  dashed,
}: {
  label: string;
  spans: PreviewSpan[];
  from: number;
  span: number;
  dashed?: boolean;
}) {
  return (
    <View style={{ gap: space.xs }} aria-label={`${label}: ${spans.length} ${spans.length === 1 ? 'alarm' : 'alarms'}`}>
      <Text variant="small" muted>
        {label} · {spans.length} {spans.length === 1 ? 'alarm' : 'alarms'}
      </Text>
      <SegmentStrip
        colour={dashed ? palette.textMuted : palette.accent}
        segments={spans.map((x) => {
          const a = Date.parse(x.from);
          const b = x.to ? Date.parse(x.to) : from + span;
          return { left: ((a - from) / span) * 100, width: ((b - a) / span) * 100 };
        })}
      />
    </View>
  );
}
