import { Link, usePathname } from 'expo-router';
import { Pressable, ScrollView, StyleSheet, View } from 'react-native';

import { useSignOut } from '@/components/data/session';
import { useLayout } from '@/components/theme/breakpoints';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import type { Person } from '@/telemetry/api';
import { type Action, can, roleLabels } from '@/telemetry/roles';

const links: { href: string; label: string; action: Action }[] = [
  { href: '/', label: 'Board', action: 'sites.read' },
  { href: '/alarms', label: 'Alarms', action: 'alarms.read' },
  { href: '/sites', label: 'Sites', action: 'sites.read' },
  { href: '/rules', label: 'Rules', action: 'rules.read' },
  { href: '/controllers', label: 'Controllers', action: 'controllers.read' },
  { href: '/reports', label: 'Reports', action: 'reports.read' },
  { href: '/visits', label: 'Site visits', action: 'visits.read' },
  { href: '/calculators', label: 'Calculators', action: 'calculators.use' },
  { href: '/people', label: 'People', action: 'people.read' },
];

export function NavBar({ person }: { person: Person }) {
  const path = usePathname();
  const signOut = useSignOut();
  const { layout } = useLayout();
  const phone = layout === 'phone';
  const signOutButton = (
    <Pressable accessibilityRole="button" onPress={() => signOut.mutate()} style={styles.link}>
      <Text style={{ color: palette.onAccent }}>Sign out</Text>
    </Pressable>
  );
  return (
    <View style={[styles.bar, phone && styles.phoneBar]} role="navigation">
      <Text strong variant="title" style={{ color: palette.onAccent }}>
        Thawline
      </Text>
      <ScrollView
        horizontal={phone}
        style={styles.scroll}
        contentContainerStyle={styles.links}
        showsHorizontalScrollIndicator={false}
      >
        {links
          .filter((l) => can(person.role, l.action))
          .map((l) => {
            const here = l.href === '/' ? path === '/' : path.startsWith(l.href);
            return (
              <Link
                key={l.href}
                href={l.href as '/'}
                style={[styles.link, here && styles.here]}
                aria-current={here ? 'page' : undefined}
              >
                <Text strong={here} style={{ color: palette.onAccent }}>
                  {l.label}
                </Text>
              </Link>
            );
          })}
        {phone ? signOutButton : null}
      </ScrollView>
      {phone ? null : (
        <View style={styles.me}>
          <Text variant="small" style={{ color: palette.onAccent }}>
            {person.name} · {roleLabels[person.role]}
          </Text>
          {signOutButton}
        </View>
      )}
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
  // no wrap here: in a wrapping column the line takes its widest child's content width and the page scrolls sideways
  phoneBar: { flexDirection: 'column', flexWrap: 'nowrap', alignItems: 'stretch', gap: space.xs },
  scroll: { flexGrow: 1, flexShrink: 1 },
  links: { flexDirection: 'row', gap: space.xs },
  link: { minHeight: size.touch, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: 6 },
  here: { backgroundColor: palette.trace },
  me: { flexDirection: 'row', alignItems: 'center', gap: space.sm },
});
