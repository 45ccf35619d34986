import { useState } from 'react';
import { StyleSheet, View } from 'react-native';
import { signInBodySchema } from '../../telemetry/api';
import { describeError } from '../data/api-client';
import { useSignIn } from '../data/session';
import { palette } from '../theme/palette';
import { size, space } from '../theme/tokens';
import { Button } from '../ui/button';
import { Card } from '../ui/screen';
import { Text } from '../ui/text';
import { TextField } from '../ui/text-field';

export function SignInForm() {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const [errors, setErrors] = useState<Record<string, string>>({});
  const signIn = useSignIn();
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
        <Text variant="heading" role="heading" aria-level={1}>Thawline</Text>
        <Text muted>Antenna de-icing and site alarms</Text>
        <Card>
          <TextField label="E-mail" value={email} onChangeText={setEmail} autoCapitalize="none" autoComplete="email" keyboardType="email-address" inputMode="email" error={errors.email} onSubmitEditing={submit} />
          <TextField label="Password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="current-password" error={errors.password} onSubmitEditing={submit} />
          {signIn.isError ? <Text role="alert" style={{ color: palette.critical }}>{describeError(signIn.error)}</Text> : null}
          <Button label="Sign in" onPress={submit} busy={signIn.isPending} />
        </Card>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: palette.background, alignItems: 'center', justifyContent: 'center', padding: space.lg },
  box: { width: '100%', maxWidth: size.tileMin * 1.6, gap: space.md },
});
