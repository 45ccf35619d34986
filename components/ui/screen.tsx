import type { ReactNode } from 'react';
import { ScrollView, StyleSheet, View } from 'react-native';

import { useLayout } from '@/components/theme/breakpoints';
import { palette } from '@/components/theme/palette';
import { size, space } from '@/components/theme/tokens';

import { Text } from './text';

/** The one layout primitive: padding and width follow the breakpoint. */
export function Screen({
  title,
  actions,
  children,
  scroll = true,
  full,
}: {
  title?: string;
  actions?: ReactNode;
  children: ReactNode;
  scroll?: boolean;
  full?: boolean;
}) {
  const { layout } = useLayout();
  const pad = layout === 'phone' ? space.md : space.xl;
  const body = (
    <View style={[styles.inner, { padding: pad, maxWidth: full || layout === 'wall' ? undefined : size.maxContent }]}>
      {title ? (
        <View style={styles.head}>
          <Text variant="heading" role="heading" aria-level={1}>
            {title}
          </Text>
          {actions ? <View style={styles.actions}>{actions}</View> : null}
        </View>
      ) : null}
      {children}
    </View>
  );
  return scroll ? (
    <ScrollView style={styles.root} contentContainerStyle={styles.content}>
      {body}
    </ScrollView>
  ) : (
    <View style={[styles.root, styles.content]}>{body}</View>
  );
}

export function Card({ children, tone }: { children: ReactNode; tone?: 'muted' }) {
  return <View style={[styles.card, tone === 'muted' && { backgroundColor: palette.surfaceMuted }]}>{children}</View>;
}

const styles = StyleSheet.create({
  root: { flex: 1, backgroundColor: palette.background },
  content: { alignItems: 'center' },
  inner: { width: '100%', gap: space.lg },
  head: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    alignItems: 'center',
    justifyContent: 'space-between',
    gap: space.md,
  },
  actions: { flexDirection: 'row', gap: space.sm, flexWrap: 'wrap' },
  card: {
    backgroundColor: palette.surface,
    borderRadius: 8,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    padding: space.lg,
    gap: space.sm,
  },
});
