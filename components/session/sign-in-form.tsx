import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { StyleSheet, View } from 'react-native';

import { api, describeError } from '@/components/data/api-client';
import { useSignIn } from '@/components/data/session';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { signInBodySchema } from '@/telemetry/api';

export function SignInForm() {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const signIn = useSignIn();
  const [forgot, setForgot] = useState(false);
  const resetRequest = useMutation({
    mutationFn: () => api<{ message: string }>('/auth/reset-request', { body: { email } }),
  });
  const submit = () => {
    const parsed = signInBodySchema.safeParse({ email, password });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
      return;
    }
    setErrors({});
    signIn.mutate(parsed.data);
  };
  return (
    <View style={styles.root}>
      <View style={styles.box}>
        <Text variant="heading" role="heading" aria-level={1}>
          Thawline
        </Text>
        <Text muted>Antenna de-icing and site alarms</Text>
        <Card>
          <TextField
            label="E-mail"
            value={email}
            onChangeText={setEmail}
            autoCapitalize="none"
            autoComplete="email"
            keyboardType="email-address"
            inputMode="email"
            error={errors.email}
            onSubmitEditing={submit}
          />
          <TextField
            label="Password"
            value={password}
            onChangeText={setPassword}
            secureTextEntry
            autoComplete="current-password"
            error={errors.password}
            onSubmitEditing={submit}
          />
          {signIn.isError ? (
            <Text role="alert" style={{ color: palette.invalid }}>
              {describeError(signIn.error)}
            </Text>
          ) : null}
          <Button label="Sign in" onPress={submit} busy={signIn.isPending} />
          <Button kind="plain" label="Forgot your password?" onPress={() => setForgot(true)} />
        </Card>
        {forgot ? (
          <Card>
            <Text>
              Enter your e-mail address above and ask for a link to choose a new password. The link works once, for an
              hour.
            </Text>
            {resetRequest.isSuccess ? <Text role="status">{resetRequest.data.message}</Text> : null}
            {resetRequest.isError ? (
              <Text role="alert" style={{ color: palette.invalid }}>
                {describeError(resetRequest.error)}
              </Text>
            ) : null}
            <Button
              kind="plain"
              label="E-mail me a reset link"
              busy={resetRequest.isPending}
              onPress={() =>
                signInBodySchema.shape.email.safeParse(email).success
                  ? resetRequest.mutate()
                  : setErrors({ email: 'Enter a valid e-mail address' })
              }
            />
          </Card>
        ) : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  root: {
    flex: 1,
    backgroundColor: palette.background,
    alignItems: 'center',
    justifyContent: 'center',
    padding: space.lg,
  },
  box: { width: '100%', maxWidth: size.tileMin * 1.6, gap: space.md },
});
