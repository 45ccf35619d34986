import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { usePreview, useSaveRule } from '@/components/data/rules';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
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

const paramWords: Record<string, [string, string | undefined]> = {
  limit: ['Limit', ':1'],
  forwardFloorW: ['Transmitter counts as off below', 'W'],
  limitW: ['Limit', 'W'],
  risePerMin: ['Rise', 'per minute'],
  windowMin: ['Over', 'min'],
  minCurrentFraction: ['Least share of rated current', '0–1'],
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
export function RuleEditor({
  effective,
  all,
  place,
  canWrite,
}: {
  effective: Rule;
  all: Rule[];
  place: { controllerId: number; siteId: number; antennaId: number | null };
  canWrite: boolean;
}) {
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
        <Text variant="title" role="heading" aria-level={2}>
          {ruleLabels[effective.kind]}
        </Text>
        <Text variant="small" muted>
          In force here: the {effective.scope} rule{effective.scope === 'global' ? ' (site practice defaults)' : ''}.
        </Text>
        {canWrite ? (
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
                  <Text role="status">
                    Over {preview.data.days} day{preview.data.days > 1 ? 's' : ''} ({preview.data.readings}{' '}
                    {preview.data.basis}): the rule in force would have raised{' '}
                    <Text strong>{preview.data.current}</Text> alarm{preview.data.current === 1 ? '' : 's'}; these
                    settings <Text strong>{preview.data.proposed}</Text>.
                  </Text>
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
            {Object.entries(effective.params)
              .map(([k, x]) => `${paramWords[k]?.[0] ?? k} ${x}${paramWords[k]?.[1] ? ` ${paramWords[k][1]}` : ''}`)
              .join(' · ')}{' '}
            · {effective.priority} · on-delay {effective.onDelayS} s · off-delay {effective.offDelayS} s
          </Text>
        )}
      </Card>
    </View>
  );
}
