import { Link } from 'expo-router';
import { View } from 'react-native';

import { prioritySigns } from '@/components/alarms/words';
import { useAlarms } from '@/components/data/alarms';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Badge } from '@/components/ui/badge';
import { Text } from '@/components/ui/text';
import { type AlarmCounts, countAlarms } from '@/telemetry/board';

type Item = { label: string; tone: 'critical' | 'high' | 'medium' | 'low' | 'neutral' };

/** "2 ▲▲ critical", "1 ▲ high", "3 acknowledged", "1 shelved"… each with the tone of its priority. */
export function bannerItems(c: AlarmCounts): Item[] {
  const out: Item[] = (['critical', 'high', 'medium', 'low'] as const)
    .filter((p) => c.waiting[p] > 0)
    .map((p) => ({ label: `${c.waiting[p]} ${prioritySigns[p]} ${p}`, tone: p }));
  if (c.acknowledged) out.push({ label: `${c.acknowledged} acknowledged`, tone: 'neutral' });
  if (c.shelved) out.push({ label: `${c.shelved} shelved`, tone: 'neutral' });
  if (c.suppressed) out.push({ label: `${c.suppressed} suppressed`, tone: 'neutral' });
  if (c.outOfService) out.push({ label: `${c.outOfService} out of service`, tone: 'neutral' });
  return out;
}

/**
 * The alarm summary at the top of every screen: what is waiting for someone by
 * priority, and what is acknowledged, shelved or out of service, so nothing
 * open disappears from view. Tapping it opens the alarm list.
 */
export function AlarmBanner() {
  const alarms = useAlarms({ open: '1' });
  if (!alarms.data) return null;
  const c = countAlarms(alarms.data);
  const waiting = c.waiting.critical + c.waiting.high + c.waiting.medium + c.waiting.low;
  const items = bannerItems(c);
  return (
    <Link href="/alarms" aria-label={`Alarms: ${items.length ? items.map((i) => i.label).join(', ') : 'none open'}`}>
      <View
        role="status"
        style={{
          flexDirection: 'row',
          flexWrap: 'wrap',
          alignItems: 'center',
          gap: space.xs,
          paddingHorizontal: space.lg,
          paddingVertical: space.xs,
          backgroundColor: waiting ? palette.surface : palette.background,
          borderBottomWidth: 1,
          borderColor: palette.border,
          width: '100%',
        }}
      >
        {items.length === 0 ? (
          <Text variant="small" muted>
            No open alarms
          </Text>
        ) : (
          <>
            <Text variant="small" strong>
              {waiting ? `${waiting} waiting:` : 'Alarms:'}
            </Text>
            {items.map((i) => (
              <Badge key={i.label} label={i.label} tone={i.tone} />
            ))}
          </>
        )}
      </View>
    </Link>
  );
}
