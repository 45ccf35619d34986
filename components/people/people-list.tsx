import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { useInvite, useSendReset, useUpdatePerson } from '@/components/data/people';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { inviteBodySchema, type Person } from '@/telemetry/api';
import { type Role, roleLabels, roles } from '@/telemetry/roles';

const roleOptions = roles.map((r) => ({ value: r, label: roleLabels[r] }));

export function PeopleList({ people, me }: { people: Person[]; me: Person }) {
  const update = useUpdatePerson();
  const reset = useSendReset();
  return (
    <View style={{ gap: space.sm }} role="list">
      {people.map((p) => (
        <View role="listitem" key={p.id} aria-label={`Person ${p.name}`}>
          <Card>
            <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
              <Text strong>{p.name}</Text>
              {!p.active ? <Badge label="Deactivated" /> : null}
            </View>
            <Text variant="small" muted>
              {p.email} · {roleLabels[p.role]}
            </Text>
            {p.id !== me.id ? (
              <>
                <Choice
                  label="Role"
                  value={p.role}
                  onChange={(role) => update.mutate({ id: p.id, patch: { role } })}
                  options={roleOptions}
                />
                <Button
                  kind="plain"
                  label={p.active ? 'Deactivate' : 'Reactivate'}
                  onPress={() => update.mutate({ id: p.id, patch: { active: !p.active } })}
                />
                {p.active && p.role !== 'kiosk' ? (
                  <Button
                    kind="plain"
                    label={reset.isSuccess && reset.variables === p.id ? 'Reset link sent' : 'Send password reset link'}
                    busy={reset.isPending && reset.variables === p.id}
                    onPress={() => reset.mutate(p.id)}
                  />
                ) : null}
              </>
            ) : null}
          </Card>
        </View>
      ))}
      {update.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(update.error)}
        </Text>
      ) : null}
    </View>
  );
}

export function InviteForm() {
  const [v, setV] = useState<{ email: string; name: string; role: Role }>({ email: '', name: '', role: 'technician' });
  const [errors, setErrors] = useState<Record<string, string>>({});
  const invite = useInvite();
  const submit = () => {
    const parsed = inviteBodySchema.safeParse(v);
    if (!parsed.success)
      return setErrors(Object.fromEntries(parsed.error.issues.map((i) => [String(i.path[0]), i.message])));
    setErrors({});
    invite.mutate(parsed.data, { onSuccess: () => setV({ email: '', name: '', role: v.role }) });
  };
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Invite someone
      </Text>
      <TextField label="Name" value={v.name} onChangeText={(name) => setV({ ...v, name })} error={errors.name} />
      <TextField
        label="E-mail"
        value={v.email}
        onChangeText={(email) => setV({ ...v, email })}
        autoCapitalize="none"
        inputMode="email"
        error={errors.email}
      />
      <Choice label="Role" value={v.role} onChange={(role) => setV({ ...v, role })} options={roleOptions} />
      {invite.isSuccess ? <Text role="status">Invitation sent. The link works for 7 days.</Text> : null}
      {invite.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(invite.error)}
        </Text>
      ) : null}
      <Button label="Send invitation" busy={invite.isPending} onPress={submit} />
    </Card>
  );
}
