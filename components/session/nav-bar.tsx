import { Link, usePathname } from 'expo-router';
import { useState } from 'react';
import { Pressable, StyleSheet, View } from 'react-native';

import { useAlarms } from '@/components/data/alarms';
import { useSignOut } from '@/components/data/session';
import { useLayout } from '@/components/theme/breakpoints';
import { palette, priorityColour } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import { priorities, type Priority } from '@/telemetry/alarms/machine';
import type { Person } from '@/telemetry/api';
import { countAlarms } from '@/telemetry/board';
import { can, roleLabels } from '@/telemetry/roles';

import { type Place, places } from './places';

const tabCount = 4;

const isHere = (href: string, path: string) => (href === '/' ? path === '/' : path.startsWith(href));

/** Alarms waiting for someone to acknowledge them, for the count on the Alarms link, with the worst priority among them. */
function useWaitingCount(enabled: boolean): Waiting {
  const alarms = useAlarms({ open: '1' });
  if (!enabled || !alarms.data) return { n: 0, worst: 'low' };
  const w = countAlarms(alarms.data).waiting;
  const worst = priorities.find((p) => w[p] > 0) ?? 'low';
  return { n: w.critical + w.high + w.medium + w.low, worst };
}
type Waiting = { n: number; worst: Priority };

function PlaceLink({ place, path, waiting, tab }: { place: Place; path: string; waiting: Waiting; tab?: boolean }) {
  const here = isHere(place.href, path);
  const count = place.href === '/alarms' && waiting.n > 0 ? waiting.n : 0;
  return (
    <Link href={place.href as '/'} asChild>
      <Pressable
        role="link"
        // one style object: the link hands its child's style to the DOM as given
        style={StyleSheet.flatten([tab ? styles.tab : styles.link, here && styles.here])}
        aria-current={here ? 'page' : undefined}
        aria-label={count ? `${place.label}, ${count} waiting` : undefined}
      >
        <View style={styles.linkInner}>
          <Text strong={here} variant={tab ? 'small' : undefined} style={{ color: palette.onAccent }}>
            {place.label}
          </Text>
          {count ? (
            <View style={[styles.count, { backgroundColor: priorityColour(waiting.worst).fg }]}>
              <Text variant="small" strong style={{ color: palette.onAccent }}>
                {count > 99 ? '99+' : count}
              </Text>
            </View>
          ) : null}
        </View>
      </Pressable>
    </Link>
  );
}

/**
 * Navigation. Wide screens: one bar across the top with every place, the person and
 * Sign out. Phones: a title bar on top and a tab bar at the bottom with the four most
 * used places and "More" (the rest, who is signed in, and Sign out); the Alarms link
 * carries the count waiting for acknowledgement on both.
 */
export function NavBar({ person }: { person: Person }) {
  const path = usePathname();
  const signOut = useSignOut();
  const { layout } = useLayout();
  const mine = places.filter((l) => can(person.role, l.action));
  const waiting = useWaitingCount(can(person.role, 'alarms.read'));
  const signOutButton = (
    <Pressable accessibilityRole="button" onPress={() => signOut.mutate()} style={styles.link}>
      <Text style={{ color: palette.onAccent }}>Sign out</Text>
    </Pressable>
  );
  if (layout === 'phone')
    return (
      <View style={styles.phoneTop}>
        <Text strong variant="title" style={{ color: palette.onAccent }}>
          Thawline
        </Text>
      </View>
    );
  return (
    <View style={styles.bar} role="navigation">
      <Text strong variant="title" style={{ color: palette.onAccent }}>
        Thawline
      </Text>
      <View style={styles.links}>
        {mine.map((l) => (
          <PlaceLink key={l.href} place={l} path={path} waiting={waiting} />
        ))}
      </View>
      <View style={styles.me}>
        <Text variant="small" style={{ color: palette.onAccent }}>
          {person.name} · {roleLabels[person.role]}
        </Text>
        {signOutButton}
      </View>
    </View>
  );
}

/** The phone's tab bar, at the bottom of the screen; nothing on wider screens. */
export function TabBar({ person }: { person: Person }) {
  const path = usePathname();
  const signOut = useSignOut();
  const { layout } = useLayout();
  // the sheet stays open on the page it was opened on: a place opened from it closes it
  const [moreAt, setMoreAt] = useState<string | null>(null);
  const more = moreAt === path;
  const waiting = useWaitingCount(can(person.role, 'alarms.read'));
  if (layout !== 'phone') return null;
  const mine = places.filter((l) => can(person.role, l.action));
  const tabs = mine.slice(0, tabCount);
  const rest = mine.slice(tabCount);
  const moreHere = rest.some((l) => isHere(l.href, path));
  return (
    <View role="navigation" aria-label="Places">
      {more ? (
        <View style={styles.sheet} role="menu" aria-label="More places">
          {rest.map((l) => (
            <PlaceLink key={l.href} place={l} path={path} waiting={waiting} />
          ))}
          <Text variant="small" style={{ color: palette.onAccent, paddingHorizontal: space.md }}>
            Signed in as {person.name} · {roleLabels[person.role]}
          </Text>
          <Pressable accessibilityRole="button" onPress={() => signOut.mutate()} style={styles.link}>
            <Text style={{ color: palette.onAccent }}>Sign out</Text>
          </Pressable>
        </View>
      ) : null}
      <View style={styles.tabs}>
        {tabs.map((l) => (
          <View key={l.href} style={{ flex: 1 }}>
            <PlaceLink place={l} path={path} waiting={waiting} tab />
          </View>
        ))}
        <Pressable
          accessibilityRole="button"
          aria-expanded={more}
          aria-label="More places and Sign out"
          onPress={() => setMoreAt(more ? null : path)}
          style={[styles.tab, { flex: 1 }, (more || moreHere) && styles.here]}
        >
          <Text variant="small" strong={moreHere} style={{ color: palette.onAccent }}>
            More
          </Text>
        </Pressable>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  bar: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    gap: space.md,
    paddingHorizontal: space.lg,
    paddingVertical: space.sm,
    backgroundColor: palette.accent,
  },
  phoneTop: { paddingHorizontal: space.lg, paddingVertical: space.xs, backgroundColor: palette.accent },
  links: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs, flexGrow: 1, flexShrink: 1 },
  link: { minHeight: size.touch, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: radius.md },
  linkInner: { flexDirection: 'row', alignItems: 'center', gap: space.xs },
  tab: {
    minHeight: size.touch + space.sm,
    alignItems: 'center',
    justifyContent: 'center',
    paddingHorizontal: space.xs,
    borderRadius: radius.md,
  },
  tabs: {
    flexDirection: 'row',
    gap: space.xs,
    paddingHorizontal: space.xs,
    paddingVertical: space.xs,
    backgroundColor: palette.accent,
    borderTopWidth: size.borderWidth,
    borderColor: palette.trace,
  },
  sheet: { backgroundColor: palette.accent, paddingVertical: space.sm, gap: space.xs },
  count: {
    minWidth: 22,
    paddingHorizontal: 6,
    borderRadius: 11,
    alignItems: 'center',
  },
  here: { backgroundColor: palette.trace },
  me: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
