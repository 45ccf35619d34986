import { useMutation } from '@tanstack/react-query';
import { Link, useLocalSearchParams } from 'expo-router';
import { useState } from 'react';
import { View } from 'react-native';

import { api, describeError } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card, Screen } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';

export default function Welcome() {
  const { token, reset } = useLocalSearchParams<{ token?: string; reset?: string }>();
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string | null>(null);
  const accept = useMutation({
    mutationFn: () => api<{ email: string }>('/auth/accept-invite', { body: { token, password } }),
  });
  return (
    <Screen title={reset ? 'Choose a new password' : 'Welcome to Thawline'}>
      <Card>
        {accept.isSuccess ? (
          <View style={{ gap: space.sm }}>
            <Text role="status">Your password is set for {accept.data.email}.</Text>
            <Link href="/sign-in">
              <Text strong>Sign in</Text>
            </Link>
          </View>
        ) : (
          <>
            <Text>
              Choose a password of at least 10 characters.
              {reset ? ' Every other sign-in of yours ends when you do.' : ''}
            </Text>
            <TextField
              label="New password"
              value={password}
              onChangeText={setPassword}
              secureTextEntry
              autoComplete="new-password"
              error={error ?? undefined}
            />
            {accept.isError ? (
              <Text role="alert" style={{ color: palette.invalid }}>
                {describeError(accept.error)}
              </Text>
            ) : null}
            <Button
              label="Set password"
              busy={accept.isPending}
              onPress={() =>
                password.length < 10 ? setError('At least 10 characters') : (setError(null), accept.mutate())
              }
            />
          </>
        )}
      </Card>
    </Screen>
  );
}
