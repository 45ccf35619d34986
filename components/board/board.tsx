import { useContext } from 'react';
import { StyleSheet, View } from 'react-native';

import { useAlarms } from '@/components/data/alarms';
import { liveStore } from '@/components/data/live';
import { useOpenVisits } from '@/components/data/visits';
import { breakpoints, useLayout } from '@/components/theme/breakpoints';
import { size, space } from '@/components/theme/tokens';
import { Text, TypeScale } from '@/components/ui/text';
import { useNow } from '@/components/ui/use-now';
import { anyOverdue, onSiteWords } from '@/components/visits/on-site';
import { awaitsAck } from '@/telemetry/alarms/machine';
import type { AlarmView, Site } from '@/telemetry/api';
import { orderSites, siteCondition } from '@/telemetry/board';

import { SiteTile } from './site-tile';

/**
 * On a wall screen positions never move (regions and sites by name; attention is
 * shown in place). Elsewhere attention first: a waiting alarm's priority, then the
 * live condition, decide which region and which site come first.
 */
export function arrange(
  sites: Site[],
  worst: Map<number, AlarmView>,
  mode: 'stable' | 'attention',
): [string, Site[]][] {
  const score = (s: Site) => {
    const a = worst.get(s.id);
    const waiting = a && awaitsAck(a.state) ? rank[a.priority] : 0;
    return (
      waiting * 1000 +
      (a ? rank[a.priority] * 100 : 0) +
      siteCondition(liveStore.get(s.id)?.controllers ?? []).attention
    );
  };
  return orderSites(sites, score, mode);
}

const rank: Record<string, number> = { critical: 4, high: 3, medium: 2, low: 1 };

/** The worst open alarm per site: highest priority, unacknowledged before acknowledged. */
export function worstBySite(alarms: AlarmView[]): Map<number, AlarmView> {
  const out = new Map<number, AlarmView>();
  const score = (a: AlarmView) => rank[a.priority] * 10 + (awaitsAck(a.state) ? 5 : a.state === 'acknowledged' ? 2 : 0);
  for (const a of alarms) {
    if (a.state === 'shelved' || a.state === 'out-of-service' || a.state === 'suppressed') continue;
    const cur = out.get(a.siteId);
    if (!cur || score(a) > score(cur)) out.set(a.siteId, a);
  }
  return out;
}

const tileMin = (layout: string, width: number) =>
  layout === 'wall' ? Math.max(size.wallTileMin, Math.floor(width / 6.5)) : size.tileMin;

/**
 * `order` changes when the attention order should be worked out again; the tiles keep
 * their identity (no remount), so sparklines and values do not blink. `mode` forces
 * the wall's fixed layout on any screen size.
 */
export function Board({
  sites,
  order,
  mode,
  scaled,
}: {
  sites: Site[];
  order: number;
  mode?: 'stable' | 'attention';
  /** the type is scaled around it (wall mode): no extra-large variants, tiles as wide as the scale makes them */
  scaled?: boolean;
}) {
  const { layout, width: screen } = useLayout();
  const k = useContext(TypeScale);
  const width = scaled ? screen / k : screen;
  const xl = !scaled && width >= breakpoints.wallXL;
  const alarms = useAlarms({ open: '1' });
  const worst = worstBySite(alarms.data ?? []);
  const openCount = new Map<number, number>();
  for (const a of alarms.data ?? []) openCount.set(a.siteId, (openCount.get(a.siteId) ?? 0) + 1);
  const visits = useOpenVisits();
  const now = useNow();
  const onSite = (s: Site) => {
    const here = visits.data?.filter((v) => v.siteId === s.id) ?? [];
    if (!here.length) return undefined;
    return {
      words: here.map((v) => onSiteWords(v, s.timeZone, now)).join('; '),
      overdue: anyOverdue(here, now),
    };
  };
  // on a wall screen tiles grow with the screen: about six across
  if (sites.length === 0)
    return <Text muted>No sites yet. An administrator adds sites; integrators then enrol their controllers.</Text>;
  return (
    <View style={{ gap: space.xl }} data-order={order}>
      {arrange(sites, worst, mode ?? (layout === 'wall' ? 'stable' : 'attention')).map(([region, list]) => (
        <View key={region} style={{ gap: space.sm }} aria-label={`Region ${region}`}>
          <Text variant="title" role="heading" aria-level={2}>
            {region}
          </Text>
          <View style={styles.grid}>
            {list.map((s) => (
              <View
                key={s.id}
                style={{
                  flexGrow: 1,
                  flexBasis: tileMin(layout, width) * k,
                  maxWidth: layout === 'phone' ? undefined : tileMin(layout, width) * 1.6 * k,
                }}
              >
                <SiteTile
                  site={s}
                  wall={layout === 'wall'}
                  xl={xl}
                  alarmKind={worst.get(s.id)?.kind}
                  alarmPriority={worst.get(s.id)?.priority}
                  alarmState={worst.get(s.id)?.state}
                  alarmCount={openCount.get(s.id) ?? 0}
                  onSite={onSite(s)}
                />
              </View>
            ))}
          </View>
        </View>
      ))}
    </View>
  );
}

const styles = StyleSheet.create({ grid: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md } });
