import { StyleSheet, View } from 'react-native';

import { useAlarms } from '@/components/data/alarms';
import { liveStore, useLiveConnection } from '@/components/data/live';
import { bannerItems } from '@/components/session/alarm-banner';
import { palette, priorityColour } from '@/components/theme/palette';
import { radius, space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import { useNow } from '@/components/ui/use-now';
import type { Priority } from '@/telemetry/alarms/machine';
import { countAlarms } from '@/telemetry/board';
import { formatTime } from '@/telemetry/time';

const toneColours = (tone: Priority | 'neutral') =>
  tone === 'neutral' ? { fg: palette.textMuted, bg: palette.surfaceMuted } : priorityColour(tone);

/** "4 s ago", "3 min ago", "2 h ago". */
export function ageWords(ms: number): string {
  const s = Math.max(0, Math.round(ms / 1000));
  if (s < 60) return `${s} s ago`;
  if (s < 3600) return `${Math.floor(s / 60)} min ago`;
  return `${Math.floor(s / 3600)} h ago`;
}

/**
 * The wall's top strip (its type grows with the screen through `TypeScale`): the alarm
 * counts by priority with their signs, the clock (local and UTC), and how fresh the
 * data is. A lost link is one banner across the screen, with the age of the values.
 */
export function WallHeader({ scale }: { scale: number }) {
  const now = useNow(1000);
  const alarms = useAlarms({ open: '1' });
  const conn = useLiveConnection();
  const items = alarms.data ? bannerItems(countAlarms(alarms.data)) : [];
  const last = liveStore.lastReadingAt;
  return (
    <View>
      {conn !== 'open' ? (
        <View role="alert" style={[styles.lost, { padding: space.sm * scale }]}>
          <Text variant="title" style={{ color: palette.onAccent }}>
            {conn === 'connecting' ? 'Connecting to Thawline…' : 'Link to Thawline lost, retrying.'} Values shown are
            from before{last ? ` (${ageWords(now - last)})` : ''}; controllers are not to blame.
          </Text>
        </View>
      ) : null}
      <View style={[styles.strip, { padding: space.md * scale, gap: space.lg * scale }]}>
        <View style={[styles.alarms, { gap: space.sm * scale }]} role="status" aria-label="Open alarms">
          {alarms.data && items.length === 0 ? (
            <Text variant="title" muted>
              No open alarms
            </Text>
          ) : null}
          {items.map((i) => (
            <View
              key={i.label}
              style={{
                backgroundColor: toneColours(i.tone).bg,
                borderRadius: radius.sm * scale,
                paddingHorizontal: space.sm * scale,
              }}
            >
              <Text variant="title" style={{ color: toneColours(i.tone).fg }}>
                {i.label}
              </Text>
            </View>
          ))}
        </View>
        <View style={{ alignItems: 'flex-end' }}>
          <Text variant="wallFigure" strong aria-label="Local time">
            {formatTime(now, { seconds: true, date: false })}
          </Text>
          <Text muted>
            {formatTime(now, { date: true }).slice(0, 10)} · {formatTime(now, { timeZone: 'UTC', date: false })}
          </Text>
          <Text style={{ color: conn === 'open' ? palette.textMuted : palette.linkLost }} aria-label="Data age">
            {last ? `Newest reading ${ageWords(now - last)}` : 'No reading since this screen opened'}
          </Text>
        </View>
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  // the link is this screen's, not a controller's: not the silent colour
  lost: { backgroundColor: palette.linkLost, width: '100%' },
  strip: {
    flexDirection: 'row',
    flexWrap: 'wrap',
    justifyContent: 'space-between',
    alignItems: 'center',
    backgroundColor: palette.surface,
    borderBottomWidth: 1,
    borderColor: palette.border,
  },
  alarms: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', flexShrink: 1 },
});
