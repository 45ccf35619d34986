import { useState } from 'react';
import { Pressable, View } from 'react-native';

import { prioritySign } from '@/components/alarms/words';
import { describeError } from '@/components/data/api-client';
import { usePreview, useSaveRule } from '@/components/data/rules';
import { useLayout } from '@/components/theme/breakpoints';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { fieldWords, typedNumber } from '@/components/ui/field-words';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { priorities } from '@/telemetry/alarms/machine';
import {
  checkParams,
  type Rule,
  type RuleBody,
  ruleBodySchema,
  ruleLabels,
  type RuleScope,
} from '@/telemetry/alarms/rules';

import { PreviewChart } from './preview-chart';

const paramWords: Record<string, [string, string | undefined]> = {
  limit: ['Limit', ':1'],
  forwardFloorW: ['Transmitter counts as off below', 'W'],
  limitW: ['Limit', 'W'],
  risePerMin: ['Rise', 'per minute'],
  windowMin: ['Over', 'min'],
  minCurrentFraction: ['Least share of rated current', 'of rated, 0–1'],
  volts: ['Heater supply', 'V'],
  intervals: ['Missed reports', undefined],
  limitPct: ['Battery below', '%'],
  aboveC: ['Air above', '°C'],
  holdHours: ['Within', 'h of icing'],
};
const scopeWords: Record<RuleScope, string> = {
  global: 'all sites',
  site: 'this site',
  antenna: 'this antenna',
  controller: 'this controller',
};

/** One rule kind: where its effective value comes from, a replay preview, and save to a chosen scope. */
/** "Limit 1.5:1", "Over 10 min", "Least share of rated current 0.5 of rated, 0–1" */
const paramText = (k: string, x: number | string) => {
  const [label, unit] = paramWords[k] ?? [k, undefined];
  return `${label} ${x}${unit ? (unit === ':1' ? ':1' : ` ${unit}`) : ''}`;
};

/** What the value a rule watches is measured in, for its replayed trace. */
const traceUnits: Partial<Record<Rule['kind'], string>> = {
  'vswr-warning': ':1',
  'vswr-trip': ':1',
  'reflected-high': ' W',
  'vswr-rising-icing': ' /min',
  'icing-heater-off': ' A',
  'battery-low-heating': ' %',
  'shedding-advisory': ' °C',
};

/** One line that says what a rule does: its settings, priority and delays. */
export function ruleSummary(r: Pick<Rule, 'enabled' | 'params' | 'priority' | 'onDelayS' | 'offDelayS'>): string {
  if (!r.enabled) return 'Off';
  const params = Object.entries(r.params).map(([k, x]) => paramText(k, x));
  return [
    ...params,
    `${prioritySign(r.priority)} ${r.priority}`,
    `on after ${r.onDelayS} s, off after ${r.offDelayS} s`,
  ].join(' · ');
}

export function RuleEditor({
  effective,
  all,
  place,
  canWrite,
  initiallyOpen = false,
  timeZone,
}: {
  effective: Rule;
  all: Rule[];
  place: { controllerId: number; siteId: number; antennaId: number | null };
  canWrite: boolean;
  initiallyOpen?: boolean;
  timeZone?: string;
}) {
  const [open, setOpen] = useState(initiallyOpen);
  const [chartWidth, setChartWidth] = useState(0);
  const { layout } = useLayout();
  const [v, setV] = useState(() => ({
    enabled: effective.enabled,
    priority: effective.priority,
    onDelayS: String(effective.onDelayS),
    offDelayS: String(effective.offDelayS),
    deadband: String(effective.deadband),
    guidance: effective.guidance ?? '',
    params: Object.fromEntries(Object.entries(effective.params).map(([k, x]) => [k, String(x)])) as Record<
      string,
      string
    >,
  }));
  const [scope, setScope] = useState<RuleScope>(effective.scope === 'global' ? 'site' : effective.scope);
  const [days, setDays] = useState<1 | 7 | 30>(7);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const preview = usePreview();
  const save = useSaveRule();
  // a preview describes the settings it was asked for: a change clears it
  const change = (next: typeof v) => {
    setV(next);
    if (preview.data || preview.error) preview.reset();
  };

  const body = (): RuleBody | null => {
    const b = {
      enabled: v.enabled,
      priority: v.priority,
      onDelayS: typedNumber(v.onDelayS),
      offDelayS: typedNumber(v.offDelayS),
      deadband: typedNumber(v.deadband),
      guidance: v.guidance.trim() || null,
      params: Object.fromEntries(Object.entries(v.params).map(([k, x]) => [k, typedNumber(x)])),
    };
    const parsed = ruleBodySchema.safeParse(b);
    const params = checkParams(effective.kind, b.params);
    const errs: Record<string, string> = {};
    if (!parsed.success) for (const i of parsed.error.issues) errs[String(i.path[0])] = fieldWords(i);
    if (!params.success) for (const i of params.error.issues) errs[`params.${String(i.path[0])}`] = fieldWords(i);
    setErrors(errs);
    return Object.keys(errs).length ? null : (parsed.data as RuleBody);
  };
  const scopeId =
    scope === 'site'
      ? place.siteId
      : scope === 'antenna'
        ? place.antennaId
        : scope === 'controller'
          ? place.controllerId
          : null;
  const existing =
    all.find((r) => r.kind === effective.kind && r.scope === scope && (scope === 'global' || r.scopeId === scopeId)) ??
    null;

  return (
    <View aria-label={`Rule ${ruleLabels[effective.kind]}`} role="group">
      <Card>
        <Pressable
          role="button"
          aria-expanded={open}
          aria-label={`${ruleLabels[effective.kind]}: ${ruleSummary(effective)}`}
          onPress={() => setOpen(!open)}
          style={{ minHeight: size.touch, gap: space.xs }}
        >
          <View style={{ flexDirection: 'row', justifyContent: 'space-between', gap: space.sm }}>
            <Text variant="title" role="heading" aria-level={2}>
              {ruleLabels[effective.kind]}
            </Text>
            <Text variant="title" aria-hidden>
              {open ? '▾' : '▸'}
            </Text>
          </View>
          <Text variant="small" muted>
            {ruleSummary(effective)} · the {effective.scope} rule
            {effective.scope === 'global' ? ' (site practice defaults)' : ''}
          </Text>
        </Pressable>
        {!open ? null : canWrite ? (
          <>
            <Choice
              label="Enabled"
              value={v.enabled ? 'on' : 'off'}
              onChange={(x) => change({ ...v, enabled: x === 'on' })}
              options={[
                { value: 'on', label: 'On' },
                { value: 'off', label: 'Off' },
              ]}
            />
            <Choice
              label="Priority"
              value={v.priority}
              onChange={(p) => change({ ...v, priority: p })}
              options={priorities.map((p) => ({ value: p, label: p }))}
            />
            {Object.keys(v.params).map((k) => (
              <TextField
                key={k}
                label={paramWords[k]?.[0] ?? k}
                unit={paramWords[k]?.[1]}
                value={v.params[k]}
                inputMode="decimal"
                error={errors[`params.${k}`]}
                onChangeText={(x) => change({ ...v, params: { ...v.params, [k]: x } })}
              />
            ))}
            <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
              <View style={{ flexGrow: 1, flexBasis: 140 }}>
                <TextField
                  label="On-delay"
                  unit="s"
                  value={v.onDelayS}
                  inputMode="numeric"
                  error={errors.onDelayS}
                  onChangeText={(x) => change({ ...v, onDelayS: x })}
                />
              </View>
              <View style={{ flexGrow: 1, flexBasis: 140 }}>
                <TextField
                  label="Off-delay"
                  unit="s"
                  value={v.offDelayS}
                  inputMode="numeric"
                  error={errors.offDelayS}
                  onChangeText={(x) => change({ ...v, offDelayS: x })}
                />
              </View>
              <View style={{ flexGrow: 1, flexBasis: 140 }}>
                <TextField
                  label="Deadband"
                  value={v.deadband}
                  inputMode="decimal"
                  error={errors.deadband}
                  onChangeText={(x) => change({ ...v, deadband: x })}
                />
              </View>
            </View>
            <TextField
              label="Response guidance"
              value={v.guidance}
              multiline
              maxLength={2000}
              error={errors.guidance}
              hint="Shown with every alarm this rule raises: what to check first, whom to call, the cautions (falling ice, RF exposure, gas) that apply here."
              onChangeText={(x) => change({ ...v, guidance: x })}
              style={{ minHeight: 88, maxWidth: 720 }}
            />
            {effective.kind !== 'silent' ? (
              <View style={{ gap: space.sm }}>
                <Choice
                  label="Replay over the last"
                  value={days}
                  onChange={(d) => {
                    setDays(d);
                    if (preview.data) preview.reset();
                  }}
                  options={[
                    { value: 1, label: '1 day' },
                    { value: 7, label: '7 days' },
                    { value: 30, label: '30 days' },
                  ]}
                />
                <Button
                  kind="plain"
                  label="Preview"
                  busy={preview.isPending}
                  onPress={() => {
                    const b = body();
                    if (b) preview.mutate({ ...b, kind: effective.kind, controllerId: place.controllerId, days });
                  }}
                />
                {preview.data ? (
                  <View style={{ gap: space.sm }} onLayout={(e) => setChartWidth(e.nativeEvent.layout.width)}>
                    <Text role="status">
                      Over {preview.data.days} day{preview.data.days > 1 ? 's' : ''} ({preview.data.readings}{' '}
                      {preview.data.basis}): the rule in force would have raised{' '}
                      <Text strong>{preview.data.current}</Text> alarm{preview.data.current === 1 ? '' : 's'}; these
                      settings <Text strong>{preview.data.proposed}</Text>.
                    </Text>
                    <PreviewChart
                      p={preview.data}
                      width={chartWidth}
                      unit={traceUnits[effective.kind] ?? ''}
                      timeZone={timeZone}
                      wide={layout !== 'phone'}
                    />
                  </View>
                ) : null}
                {preview.isError ? (
                  <Text role="alert" style={{ color: palette.invalid }}>
                    {describeError(preview.error)}
                  </Text>
                ) : null}
              </View>
            ) : null}
            <Choice
              label="Save for"
              value={scope}
              onChange={setScope}
              options={(['controller', 'antenna', 'site', 'global'] as RuleScope[])
                .filter((s) => s !== 'antenna' || place.antennaId != null)
                .map((s) => ({ value: s, label: scopeWords[s] }))}
            />
            <Button
              label="Save rule"
              busy={save.isPending}
              onPress={() => {
                const b = body();
                if (b) save.mutate({ existing, kind: effective.kind, scope, scopeId, body: b });
              }}
            />
            {save.isSuccess ? (
              <Text role="status">Saved for {scopeWords[scope]}. The change is in the audit log.</Text>
            ) : null}
            {save.isError ? (
              <Text role="alert" style={{ color: palette.invalid }}>
                {describeError(save.error)}
              </Text>
            ) : null}
          </>
        ) : (
          <Text>
            {effective.guidance ? `Response guidance: ${effective.guidance}` : 'No response guidance written yet.'}
          </Text>
        )}
      </Card>
    </View>
  );
}
