import { useQuery } from '@tanstack/react-query';
import { createElement, useState } from 'react';
import { Platform, Pressable, View } from 'react-native';

import { api, ApiFailure } from '@/components/data/api-client';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { QueryState } from '@/components/ui/query-state';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { formatTime } from '@/telemetry/time';

type Message = {
  id: string;
  at: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string | null;
};

/** Development only: every e-mail the local SMTP catcher caught, rendered as it would arrive. */
export function Outbox() {
  const mail = useQuery({
    queryKey: ['dev', 'outbox'],
    refetchInterval: 5000,
    retry: false,
    queryFn: async () => (await api<{ messages: Message[] }>('/dev/outbox')).messages,
  });
  const [open, setOpen] = useState<string | null>(null);
  if (mail.error instanceof ApiFailure && mail.error.status === 404)
    return <Text muted>The outbox exists only outside production: there, mail goes to the real mail server.</Text>;
  return (
    <QueryState query={mail}>
      {(list) => (
        <View style={{ gap: space.sm }}>
          {list.length === 0 ? (
            <Text muted>Nothing caught yet. Invitations, password resets and alarm e-mails appear here.</Text>
          ) : null}
          {list.map((m) => (
            <Card key={m.id}>
              <Pressable
                onPress={() => setOpen(open === m.id ? null : m.id)}
                aria-expanded={open === m.id}
                role="button"
              >
                <Text strong>{m.subject}</Text>
                <Text variant="small" muted>
                  To {m.to.join(', ')} · {formatTime(m.at, { seconds: true })} · from {m.from}
                </Text>
              </Pressable>
              {open === m.id ? (
                <View style={{ gap: space.sm }}>
                  {m.html && Platform.OS === 'web'
                    ? // the message's HTML in a sandboxed frame: no scripts, no access to this page
                      createElement('iframe', {
                        title: `E-mail: ${m.subject}`,
                        sandbox: '',
                        srcDoc: m.html,
                        style: {
                          width: '100%',
                          minHeight: 320,
                          border: `1px solid ${palette.border}`,
                          background: palette.surface,
                        },
                      })
                    : null}
                  <Text selectable style={{ fontFamily: 'monospace' }}>
                    {m.text}
                  </Text>
                </View>
              ) : null}
            </Card>
          ))}
        </View>
      )}
    </QueryState>
  );
}
