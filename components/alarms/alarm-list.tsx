import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';

import { useAckMany } from '@/components/data/alarms';
import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import { awaitsAck } from '@/telemetry/alarms/machine';
import { alarmQueue } from '@/telemetry/alarms/queue';
import type { AlarmView, Site } from '@/telemetry/api';
import { formatClock } from '@/telemetry/time';

import { AlarmRow } from './alarm-row';
import { type AlarmFilter, filterAlarms, noFilter } from './filter';
import { kindWords, priorityTone } from './words';

/**
 * Open alarms in the order of the alarm queue (telemetry/alarms/queue): most urgent
 * first; a flooding site's lower-priority alarms fold into one summary that never
 * hides anything outranking what is listed. Filters and a search narrow the list
 * (and say how many they hide); in select mode many alarms are acknowledged at once.
 */
export function AlarmList({ alarms, sites, canAck }: { alarms: AlarmView[]; sites: Site[]; canAck: boolean }) {
  const [expanded, setExpanded] = useState<Set<number>>(new Set());
  const [filter, setFilter] = useState<AlarmFilter>(noFilter);
  const [selecting, setSelecting] = useState(false);
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const [showFilters, setShowFilters] = useState(false);
  const active = [filter.priority, filter.state, filter.kind].filter(Boolean).length;
  const name = (siteId: number) => sites.find((s) => s.id === siteId)?.name ?? `Site ${siteId}`;
  const shown = filterAlarms(alarms, filter, name);
  const kinds = useMemo(() => [...new Set(alarms.map((a) => a.kind))].sort(), [alarms]);
  // while selecting, nothing is folded: every alarm can be ticked
  const queue = alarmQueue(shown, selecting ? new Set(shown.map((a) => a.siteId)) : expanded);
  const selectable = shown.filter((a) => awaitsAck(a.state));
  // alarms acknowledged elsewhere meanwhile drop out of the selection
  const chosen = selectable.filter((a) => selected.has(a.id));
  const toggle = (id: number) => {
    const next = new Set(selected);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    setSelected(next);
  };
  const hidden = alarms.length - shown.length;
  return (
    <View style={{ gap: space.md }}>
      <View style={styles.filters} role="group" aria-label="Narrow the alarm list">
        <View style={styles.search}>
          <TextField
            label="Search"
            value={filter.text}
            onChangeText={(text) => setFilter({ ...filter, text })}
            placeholder="Site, kind or words of the message"
            autoCapitalize="none"
          />
        </View>
        <Button
          kind="plain"
          label={`${showFilters ? 'Hide filters' : 'Filters'}${active ? ` (${active} on)` : ''}`}
          aria-expanded={showFilters}
          onPress={() => setShowFilters(!showFilters)}
        />
        {showFilters ? (
          <View style={styles.choices}>
            <Choice
              label="Priority"
              value={filter.priority ?? 'any'}
              onChange={(v) => setFilter({ ...filter, priority: v === 'any' ? null : v })}
              options={[
                { value: 'any', label: 'Any' },
                { value: 'critical', label: 'Critical' },
                { value: 'high', label: 'High' },
                { value: 'medium', label: 'Medium' },
                { value: 'low', label: 'Low' },
              ]}
            />
            <Choice
              label="State"
              value={filter.state ?? 'any'}
              onChange={(v) => setFilter({ ...filter, state: v === 'any' ? null : v })}
              options={[
                { value: 'any', label: 'Any' },
                { value: 'waiting', label: 'Not acknowledged' },
                { value: 'acknowledged', label: 'Acknowledged' },
                { value: 'shelved', label: 'Shelved' },
                { value: 'out-of-service', label: 'Out of service' },
              ]}
            />
            {kinds.length > 1 ? (
              <Choice
                label="Kind"
                value={filter.kind ?? 'any'}
                onChange={(v) => setFilter({ ...filter, kind: v === 'any' ? null : v })}
                options={[
                  { value: 'any', label: 'Any' },
                  ...kinds.map((k) => ({ value: k, label: kindWords[k] ?? k })),
                ]}
              />
            ) : null}
          </View>
        ) : null}
      </View>
      <View style={styles.bar}>
        <Text muted aria-live="polite">
          {shown.length} of {alarms.length} open alarms shown
          {hidden ? ` · ${hidden} hidden by the filter` : ''}
        </Text>
        {hidden ? <Button kind="plain" label="Show all" onPress={() => setFilter(noFilter)} /> : null}
        {canAck ? (
          <Button
            kind="plain"
            label={selecting ? 'Done selecting' : 'Select to acknowledge'}
            onPress={() => {
              setSelecting(!selecting);
              setSelected(new Set());
            }}
          />
        ) : null}
      </View>
      {selecting ? (
        <AckSelected
          chosen={chosen}
          selectable={selectable}
          onSelectAll={() => setSelected(new Set(selectable.map((a) => a.id)))}
          onClear={() => setSelected(new Set())}
          onDone={() => setSelected(new Set())}
        />
      ) : null}
      <View style={{ gap: space.sm }} role="list">
        {queue.map((e) => {
          if (e.kind === 'alarm') {
            const site = sites.find((s) => s.id === e.alarm.siteId);
            if (!selecting) return <AlarmRow key={e.alarm.id} a={e.alarm} site={site} />;
            return (
              <SelectableRow
                key={e.alarm.id}
                a={e.alarm}
                site={site}
                can={awaitsAck(e.alarm.state)}
                on={selected.has(e.alarm.id)}
                onToggle={() => toggle(e.alarm.id)}
              />
            );
          }
          const first = e.folded.reduce((m, a) => (a.raisedAt < m ? a.raisedAt : m), e.folded[0].raisedAt);
          return (
            <View role="listitem" key={`storm-${e.siteId}`} aria-label={`Storm summary ${name(e.siteId)}`}>
              <Card>
                <Text strong>
                  {name(e.siteId)}: {e.folded.length} more alarms, first at {formatClock(first)}
                </Text>
                <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.xs }}>
                  {e.counts.map(([p, n]) => (
                    <Badge key={p} label={`${n} ${p}`} tone={priorityTone(p)} />
                  ))}
                </View>
                <Button
                  kind="plain"
                  label="Show each alarm"
                  onPress={() => setExpanded(new Set([...expanded, e.siteId]))}
                />
              </Card>
            </View>
          );
        })}
        {queue.length === 0 ? <Text muted>No open alarm matches the filter.</Text> : null}
      </View>
    </View>
  );
}

function SelectableRow({
  a,
  site,
  can,
  on,
  onToggle,
}: {
  a: AlarmView;
  site?: Site;
  can: boolean;
  on: boolean;
  onToggle: () => void;
}) {
  const label = `${kindWords[a.kind] ?? a.kind} at ${site?.name ?? `site ${a.siteId}`}`;
  return (
    <View role="listitem" style={styles.selectRow}>
      <Pressable
        role="checkbox"
        aria-checked={on}
        aria-disabled={!can}
        aria-label={can ? `Select ${label}` : `${label} (already acknowledged)`}
        disabled={!can}
        onPress={onToggle}
        style={[styles.box, on && styles.boxOn, !can && styles.boxOff]}
      >
        <Text style={{ color: on ? palette.onAccent : palette.textMuted }}>{on ? '✓' : can ? '' : '–'}</Text>
      </Pressable>
      <View style={{ flex: 1 }}>
        <AlarmRow a={a} site={site} />
      </View>
    </View>
  );
}

function AckSelected({
  chosen,
  selectable,
  onSelectAll,
  onClear,
  onDone,
}: {
  chosen: AlarmView[];
  selectable: AlarmView[];
  onSelectAll: () => void;
  onClear: () => void;
  onDone: () => void;
}) {
  const ack = useAckMany();
  const [note, setNote] = useState('');
  const result = ack.data;
  return (
    <Card>
      <Text strong>
        {chosen.length} of {selectable.length} alarms waiting for acknowledgement selected
      </Text>
      <View style={styles.bar}>
        <Button kind="plain" label={`Select all ${selectable.length} shown`} onPress={onSelectAll} />
        <Button kind="plain" label="Clear" onPress={onClear} disabled={!chosen.length} />
      </View>
      <TextField
        label="Note for all of them"
        value={note}
        onChangeText={setNote}
        placeholder="What you are doing about it"
        maxLength={1000}
        style={{ maxWidth: 640 }}
      />
      <Button
        label={`Acknowledge ${chosen.length} ${chosen.length === 1 ? 'alarm' : 'alarms'}`}
        disabled={!chosen.length}
        busy={ack.isPending}
        onPress={() =>
          ack.mutate(
            { ids: chosen.map((a) => a.id), note: note.trim() },
            {
              onSuccess: () => {
                setNote('');
                onDone();
              },
            },
          )
        }
      />
      {result ? (
        <Text role="status" style={{ color: palette.ok }}>
          Acknowledged {result.acknowledged.length} {result.acknowledged.length === 1 ? 'alarm' : 'alarms'}
          {result.skipped.length
            ? `; ${result.skipped.length} skipped (${[...new Set(result.skipped.map((s) => s.reason))].join('; ')})`
            : ''}
          .
        </Text>
      ) : null}
      {ack.error ? (
        <Text role="alert" style={{ color: palette.invalid }}>
          {ack.error.message}
        </Text>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  filters: { gap: space.sm, flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end' },
  search: { minWidth: 240, flexGrow: 1, maxWidth: 480 },
  choices: { gap: space.sm, width: '100%' },
  bar: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  selectRow: { flexDirection: 'row', gap: space.sm, alignItems: 'center' },
  box: {
    width: size.touch,
    height: size.touch,
    borderRadius: radius.sm,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    backgroundColor: palette.surface,
    alignItems: 'center',
    justifyContent: 'center',
  },
  boxOn: { backgroundColor: palette.accent, borderColor: palette.accent },
  boxOff: { backgroundColor: palette.surfaceMuted },
});
