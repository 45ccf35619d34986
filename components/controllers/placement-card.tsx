import { useState } from 'react';
import { View } from 'react-native';

import { describeError } from '@/components/data/api-client';
import type { ControllerDetail } from '@/components/data/controllers';
import { useMoveController, usePlacements, useSites } from '@/components/data/sites';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Button } from '@/components/ui/button';
import { Choice } from '@/components/ui/choice';
import { Card } from '@/components/ui/screen';
import { Text } from '@/components/ui/text';
import { TextField } from '@/components/ui/text-field';
import type { Person } from '@/telemetry/api';
import { can } from '@/telemetry/roles';
import { formatTime } from '@/telemetry/time';

/** Where the controller is and has been; engineers and integrators move it here. Its readings stay its own. */
export function PlacementCard({ c, me }: { c: ControllerDetail; me: Person }) {
  const placements = usePlacements(c.id);
  const sites = useSites();
  const move = useMoveController(c.id);
  const [moving, setMoving] = useState(false);
  const [siteId, setSiteId] = useState<number | null>(c.siteId);
  const [antennaId, setAntennaId] = useState<number | null>(c.antennaId);
  const [note, setNote] = useState('');
  const site = sites.data?.find((s) => s.id === siteId);
  const zoneOf = (id: number) => sites.data?.find((s) => s.id === id)?.timeZone;
  return (
    <Card>
      <Text variant="title" role="heading" aria-level={2}>
        Where it is
      </Text>
      {(placements.data ?? []).map((p, i) => (
        <Text key={i} variant={i ? 'small' : 'body'}>
          {p.site}
          {p.antenna ? ` · ${p.antenna}` : ''}:{' '}
          {p.from ? `from ${formatTime(p.from, { timeZone: zoneOf(p.siteId) })}` : 'from enrolment'}
          {p.to ? ` to ${formatTime(p.to, { timeZone: zoneOf(p.siteId) })}` : ' (now)'}
          {p.movedBy ? `, moved by ${p.movedBy}` : ''}
        </Text>
      ))}
      {can(me.role, 'controllers.move') && c.status !== 'decommissioned' ? (
        moving ? (
          <View style={{ gap: space.sm }}>
            <Choice
              label="Site"
              searchLabel="Find a site"
              value={siteId}
              onChange={(v) => {
                setSiteId(v);
                setAntennaId(null);
              }}
              options={(sites.data ?? []).map((s) => ({ value: s.id, label: `${s.name} (${s.code})` }))}
            />
            {site ? (
              <Choice
                label="Antenna"
                value={antennaId}
                onChange={setAntennaId}
                options={site.antennas.filter((a) => !a.archivedAt).map((a) => ({ value: a.id, label: a.name }))}
              />
            ) : null}
            <TextField label="Note" value={note} onChangeText={setNote} hint="Why it moved (kept in the audit log)" />
            {move.isError ? (
              <Text role="alert" style={{ color: palette.invalid }}>
                {describeError(move.error)}
              </Text>
            ) : null}
            <View style={{ flexDirection: 'row', gap: space.sm }}>
              <Button
                label="Move controller"
                disabled={siteId == null}
                busy={move.isPending}
                onPress={() =>
                  move.mutate(
                    { siteId: siteId!, antennaId, note: note || undefined },
                    { onSuccess: () => setMoving(false) },
                  )
                }
              />
              <Button label="Cancel" kind="plain" onPress={() => setMoving(false)} />
            </View>
          </View>
        ) : (
          <Button label="Move to another antenna or site" kind="plain" onPress={() => setMoving(true)} />
        )
      ) : null}
    </Card>
  );
}
