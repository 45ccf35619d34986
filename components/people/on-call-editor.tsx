import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import { useOnCall, useSetOnCall } from '@/components/data/people';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import type { Person, Site } from '@/telemetry/api';

/** The order in which a site's alarms reach people: first on call, then escalation. */
export function OnCallEditor({ sites, people }: { sites: Site[]; people: Person[] }) {
  const [siteId, setSiteId] = useState<number | null>(sites[0]?.id ?? null);
  const list = useOnCall(siteId);
  const save = useSetOnCall(siteId);
  // the order being edited, over the saved one until the first change
  const [draft, setIds] = useState<{ siteId: number | null; ids: number[] } | null>(null);
  const ids = draft && draft.siteId === siteId ? draft.ids : (list.data ?? []).map((p) => p.id);
  const name = (id: number) => people.find((p) => p.id === id)?.name ?? `#${id}`;
  const move = (i: number, d: -1 | 1) => {
    const next = [...ids];
    [next[i], next[i + d]] = [next[i + d], next[i]];
    setIds({ siteId, ids: next });
  };
  const addable = people.filter((p) => p.active && p.role !== 'kiosk' && !ids.includes(p.id));
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        On call
      </Text>
      <Choice
        label="Site"
        searchLabel="Find a site"
        value={siteId}
        onChange={setSiteId}
        options={sites.map((s) => ({ value: s.id, label: s.name }))}
      />
      {ids.length === 0 ? <Text muted>Nobody is on call for this site: its alarms e-mail no one.</Text> : null}
      {ids.map((id, i) => (
        <View key={id} style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
          <Text strong>
            {i + 1}. {name(id)}
          </Text>
          {i > 0 ? (
            <Button kind="plain" label="Up" onPress={() => move(i, -1)} accessibilityLabel={`Move ${name(id)} up`} />
          ) : null}
          {i < ids.length - 1 ? (
            <Button kind="plain" label="Down" onPress={() => move(i, 1)} accessibilityLabel={`Move ${name(id)} down`} />
          ) : null}
          <Button
            kind="plain"
            label="Remove"
            onPress={() => setIds({ siteId, ids: ids.filter((x) => x !== id) })}
            accessibilityLabel={`Remove ${name(id)}`}
          />
        </View>
      ))}
      {addable.length ? (
        <Choice
          label="Add"
          value={null}
          onChange={(id: number) => setIds({ siteId, ids: [...ids, id] })}
          options={addable.map((p) => ({ value: p.id, label: p.name }))}
        />
      ) : null}
      {save.isSuccess ? <Text role="status">On-call order saved.</Text> : null}
      {save.isError ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {describeError(save.error)}
        </Text>
      ) : null}
      <Button label="Save on-call order" busy={save.isPending} onPress={() => save.mutate(ids)} />
    </Card>
  );
}
