import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { View } from 'react-native';

import { api, describeError } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { apiTokenBodySchema } from '@/telemetry/api';

type ApiToken = { id: string; name: string; createdAt: string; expiresAt: string };
const tokensKey = ['auth', 'tokens'] as const;

/** Named API tokens for one's own scripts: made here, shown once, revoked one by one. */
export function ApiTokensCard() {
  const qc = useQueryClient();
  const tokens = useQuery({
    queryKey: tokensKey,
    queryFn: async () => (await api<{ tokens: ApiToken[] }>('/auth/tokens')).tokens,
  });
  const [name, setName] = useState('');
  const [error, setError] = useState<string | undefined>();
  const create = useMutation({
    mutationFn: () => api<{ token: ApiToken & { token: string } }>('/auth/tokens', { body: { name } }),
    onSuccess: () => {
      setName('');
      void qc.invalidateQueries({ queryKey: tokensKey });
    },
  });
  const revoke = useMutation({
    mutationFn: (id: string) => api(`/auth/tokens/${id}`, { method: 'DELETE' }),
    onSuccess: () => void qc.invalidateQueries({ queryKey: tokensKey }),
  });
  const submit = () => {
    const parsed = apiTokenBodySchema.safeParse({ name });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message);
    setError(undefined);
    create.mutate();
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Your API tokens
      </Text>
      <Text muted>
        For scripts that read or export from Thawline: send the token as “Authorization: Bearer …”. It is shown once and
        lasts a year; revoke it here when a script is retired.
      </Text>
      {(tokens.data ?? []).map((t) => (
        <View key={t.id} style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
          <Text strong>{t.name}</Text>
          <Text variant="small" muted>
            made {t.createdAt.slice(0, 10)} · expires {t.expiresAt.slice(0, 10)}
          </Text>
          <Button
            kind="plain"
            label={`Revoke ${t.name}`}
            busy={revoke.isPending && revoke.variables === t.id}
            onPress={() => revoke.mutate(t.id)}
          />
        </View>
      ))}
      <TextField
        label="What the token is for"
        value={name}
        onChangeText={setName}
        error={error}
        onSubmitEditing={submit}
      />
      {create.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(create.error)}
        </Text>
      ) : null}
      {create.data ? (
        <Text selectable role="status">
          Copy it now, it is not shown again: {create.data.token.token}
        </Text>
      ) : null}
      <Button label="Make a token" busy={create.isPending} onPress={submit} />
    </Card>
  );
}
