import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { View } from 'react-native';

import { api, ApiFailure, describeError } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { heaterCommandSchema } from '@/telemetry/api';
import { formatTime } from '@/telemetry/time';

type Mode = 'auto' | 'forced-on' | 'forced-off';
type CommandRow = {
  id: string;
  mode: string;
  until: string | null;
  reason: string;
  sentAt: string;
  resultOk: number | boolean | null;
  resultMessage: string | null;
  person: string | null;
};

/** Heater override with a required reason and expiry; forced off during icing asks again. */
export function HeaterForm({ controllerId }: { controllerId: number }) {
  const qc = useQueryClient();
  const [mode, setMode] = useState<Mode>('forced-on');
  const [hours, setHours] = useState(2);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [confirming, setConfirming] = useState<string | null>(null);
  const history = useQuery({
    queryKey: ['commands', controllerId],
    refetchInterval: 5000,
    queryFn: async () => (await api<{ commands: CommandRow[] }>(`/controllers/${controllerId}/commands`)).commands,
  });
  const send = useMutation({
    mutationFn: (confirm: boolean) =>
      api(`/controllers/${controllerId}/heater`, {
        body: { mode, reason: reason.trim(), untilMinutes: mode === 'auto' ? undefined : hours * 60, confirm },
      }),
    onSuccess: () => {
      setConfirming(null);
      void qc.invalidateQueries({ queryKey: ['commands', controllerId] });
    },
    onError: (e) => {
      if (e instanceof ApiFailure && (e.details as { needsConfirmation?: boolean } | undefined)?.needsConfirmation)
        setConfirming(e.message);
    },
  });
  const submit = (confirm: boolean) => {
    const parsed = heaterCommandSchema.safeParse({
      mode,
      reason: reason.trim(),
      untilMinutes: mode === 'auto' ? undefined : hours * 60,
    });
    if (!parsed.success) return setError('Give a reason');
    setError(null);
    send.mutate(confirm);
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Heater override
      </Text>
      <Choice
        label="Mode"
        value={mode}
        onChange={setMode}
        options={[
          { value: 'forced-on', label: 'Forced on' },
          { value: 'forced-off', label: 'Forced off' },
          { value: 'auto', label: 'Automatic' },
        ]}
      />
      {mode !== 'auto' ? (
        <Choice
          label="Until"
          value={hours}
          onChange={setHours}
          options={[1, 2, 4, 8, 24].map((h) => ({ value: h, label: `${h} h` }))}
        />
      ) : null}
      <TextField label="Reason" value={reason} onChangeText={setReason} error={error ?? undefined} />
      <Text variant="small" muted>
        Heater circuits carry mains power: work on them only under the site’s lock-out procedure and by licensed people.
      </Text>
      {confirming ? (
        <View style={{ gap: space.sm }}>
          <Text role="alert" style={{ color: palette.invalid }}>
            {confirming}
          </Text>
          <Button kind="danger" label="Force off anyway" busy={send.isPending} onPress={() => submit(true)} />
        </View>
      ) : (
        <Button label="Send to the controller" busy={send.isPending} onPress={() => submit(false)} />
      )}
      {send.isError && !confirming ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(send.error)}
        </Text>
      ) : null}
      {(history.data ?? []).slice(0, 5).map((c) => (
        <Text key={c.id} variant="small">
          {formatTime(c.sentAt)} · {c.mode} by {c.person ?? '–'}: {c.reason} ·{' '}
          {c.resultOk == null
            ? 'waiting for the controller'
            : c.resultOk
              ? `done (${c.resultMessage})`
              : `refused: ${c.resultMessage}`}
        </Text>
      ))}
    </Card>
  );
}
