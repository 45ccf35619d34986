import * as Clipboard from 'expo-clipboard';
import { useState } from 'react';
import { View } from 'react-native';

import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { ControllerCredentials } from '@/telemetry/api';

/** Shown once: the server keeps only a hash of the password. */
export function CredentialsCard({ creds }: { creds: ControllerCredentials }) {
  const [copied, setCopied] = useState<string | null>(null);
  const copy = async (what: string, text: string) => {
    await Clipboard.setStringAsync(text);
    setCopied(what);
  };
  const rows: [string, string][] = [
    ['Broker', creds.mqtt.url],
    ['Username', creds.mqtt.username],
    ['Password', creds.mqtt.password],
    ['Telemetry topic', creds.mqtt.topics.telemetry],
    ['Command topic', creds.mqtt.topics.command],
  ];
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Credentials for {creds.serial}
      </Text>
      <Text strong>Copy the password now: it is shown only this once.</Text>
      {rows.map(([label, value]) => (
        <View key={label} style={{ gap: space.xs }}>
          <Text variant="small" muted>
            {label}
          </Text>
          {/* a fixed-width face: l, I and 1 stay apart in a password read off a screen */}
          <Text selectable aria-label={label} style={{ fontFamily: 'monospace' }}>
            {value}
          </Text>
        </View>
      ))}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        <Button kind="plain" label="Copy password" onPress={() => void copy('password', creds.mqtt.password)} />
        <Button
          kind="plain"
          label="Copy all as JSON"
          onPress={() => void copy('all', JSON.stringify(creds.mqtt, null, 2))}
        />
      </View>
      {copied ? (
        <Text variant="small" role="status">
          Copied {copied === 'all' ? 'all settings' : 'the password'}.
        </Text>
      ) : null}
      <Text variant="small" muted>
        To try it with the simulator: npm run simulate -- --serial {creds.serial} --password {creds.mqtt.password} --url{' '}
        {creds.mqtt.url}
      </Text>
    </Card>
  );
}
