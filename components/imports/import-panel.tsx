import { useMutation, useQueryClient } from '@tanstack/react-query';
import { createElement, useState } from 'react';
import { Platform, StyleSheet, View } from 'react-native';

import { api, ApiFailure, describeError } from '@/components/data/api-client';
import { refreshNetwork } from '@/components/data/sites';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { ControllerCredentials } from '@/telemetry/api';

type Row = {
  line: number;
  record: string;
  key: string;
  action: 'create' | 'update' | 'unchanged' | 'error';
  changes?: Record<string, { from: unknown; to: unknown }>;
  errors: { line: number; column: string | null; message: string }[];
};
type Plan = {
  applied: boolean;
  rows: Row[];
  counts: Record<Row['action'], number>;
  credentials?: ControllerCredentials[];
};

const actionWords = { create: 'New', update: 'Changed', unchanged: 'Unchanged', error: 'Error' } as const;

/** A CSV chosen on the web, read as text in the browser. */
function FilePicker({ onText }: { onText: (name: string, text: string) => void }) {
  if (Platform.OS !== 'web') return null;
  return createElement('input', {
    type: 'file',
    accept: '.csv,text/csv',
    'aria-label': 'Choose a CSV file',
    onChange: (e: { target: { files: FileList | null } }) => {
      const f = e.target.files?.[0];
      if (f) void f.text().then((t) => onText(f.name, t));
    },
    style: { fontSize: 16, minHeight: size.touch },
  });
}

function credentialsCsv(c: ControllerCredentials[]) {
  return (
    [
      'serial,username,password,url,telemetry_topic',
      ...c.map((x) => [x.serial, x.mqtt.username, x.mqtt.password, x.mqtt.url, x.mqtt.topics.telemetry].join(',')),
    ].join('\n') + '\n'
  );
}

/**
 * Upload a CSV: first a dry run that shows, row by row, what would be created or
 * changed and every error with its line and column; then apply it, all in one go.
 */
export function ImportPanel({ kind, what }: { kind: 'network' | 'controllers'; what: string }) {
  const qc = useQueryClient();
  const [csv, setCsv] = useState('');
  const [file, setFile] = useState<string | null>(null);
  const run = useMutation({
    mutationFn: async (apply: boolean) => {
      const form = new FormData();
      form.append('file', new Blob([csv], { type: 'text/csv' }), file ?? 'import.csv');
      try {
        return await api<Plan>(`/imports/${kind}${apply ? '?apply=1' : ''}`, { form });
      } catch (e) {
        // refused on apply although the check passed: something changed in between
        if (e instanceof ApiFailure && e.status === 422)
          throw new ApiFailure(422, 'conflict', 'Something changed since the check: check the file again.');
        throw e;
      }
    },
    onSuccess: (plan) => plan.applied && refreshNetwork(qc),
  });
  const plan = run.data;
  const template = `/api/imports/${kind}/template`;
  return (
    <View style={{ gap: space.md }}>
      <Card>
        <Text>
          Start from the template: one row per {what}. Nothing is written until you apply a file whose every row is
          right.
        </Text>
        {Platform.OS === 'web'
          ? createElement('a', { href: template, download: true }, <Text strong>Download the template (CSV)</Text>)
          : null}
        <FilePicker
          onText={(name, text) => {
            setFile(name);
            setCsv(text);
            run.reset();
          }}
        />
        <TextField
          label="Or paste the CSV here"
          value={csv}
          onChangeText={(v) => {
            setCsv(v);
            setFile(null);
            run.reset();
          }}
          multiline
          numberOfLines={6}
          style={{ minHeight: 140, fontFamily: 'monospace' }}
          autoCapitalize="none"
        />
        <View style={{ flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' }}>
          <Button
            label="Check the file"
            kind="plain"
            disabled={!csv.trim()}
            busy={run.isPending && run.variables === false}
            onPress={() => run.mutate(false)}
          />
          <Button
            label="Apply"
            disabled={!plan || plan.applied || plan.counts.error > 0}
            busy={run.isPending && run.variables === true}
            onPress={() => run.mutate(true)}
          />
        </View>
        {run.isError ? (
          <Text role="alert" style={{ color: palette.invalid }}>
            {describeError(run.error)}
          </Text>
        ) : null}
      </Card>
      {plan ? (
        <Card>
          <Text variant="title" role="heading" aria-level={2}>
            {plan.applied ? 'Applied' : 'Dry run'}: {plan.counts.create} new · {plan.counts.update} changed ·{' '}
            {plan.counts.unchanged} unchanged · {plan.counts.error} with errors
          </Text>
          {plan.counts.error > 0 ? (
            <Text style={{ color: palette.invalid }}>
              Correct the rows with errors and check the file again; nothing has been written.
            </Text>
          ) : null}
          <View role="list" style={{ gap: space.xs }}>
            {plan.rows.map((r) => (
              <View key={r.line} role="listitem" style={styles.row}>
                <Badge label={actionWords[r.action]} tone={r.action === 'error' ? 'invalid' : 'neutral'} />
                <View style={{ flexShrink: 1, gap: 2 }}>
                  <Text>
                    Line {r.line}: {r.record} {r.key}
                  </Text>
                  {r.changes && Object.keys(r.changes).length ? (
                    <Text variant="small" muted>
                      {Object.entries(r.changes)
                        .map(([k, c]) => `${k} ${String(c.from)} → ${String(c.to)}`)
                        .join(' · ')}
                    </Text>
                  ) : null}
                  {r.errors.map((e, i) => (
                    <Text key={i} variant="small" style={{ color: palette.invalid }}>
                      Line {e.line}
                      {e.column ? `, column ${e.column}` : ''}: {e.message}
                    </Text>
                  ))}
                </View>
              </View>
            ))}
          </View>
          {plan.credentials?.length ? (
            <View style={{ gap: space.sm }}>
              <Text strong>Passwords are shown this once. Keep them with the controllers’ configuration.</Text>
              {Platform.OS === 'web'
                ? createElement(
                    'a',
                    {
                      href: `data:text/csv;charset=utf-8,${encodeURIComponent(credentialsCsv(plan.credentials))}`,
                      download: 'thawline-controller-credentials.csv',
                    },
                    <Text strong>Download the credentials (CSV)</Text>,
                  )
                : null}
            </View>
          ) : null}
        </Card>
      ) : null}
    </View>
  );
}

const styles = StyleSheet.create({ row: { flexDirection: 'row', gap: space.sm, alignItems: 'flex-start' } });
