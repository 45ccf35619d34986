import { useEffect, useState } from 'react';
import { View } from 'react-native';

import { connectLive, liveStore, useLiveConnection, useSystemHealth } from '@/components/data/live';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import { durationWords } from '@/telemetry/health';

/**
 * One thin strip across every screen when the system itself is not well: the
 * browser's link to the server lost, or a part of the server down or degraded
 * ("Database unreachable for 40 s: 12,400 readings buffered"). Nothing shows
 * while all is well. A lost link is said once here, never as a controller alarm.
 */
export function SystemStrip() {
  useEffect(() => connectLive(), []);
  const connection = useLiveConnection();
  const health = useSystemHealth();
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    const t = setInterval(() => setNow(Date.now()), 5000);
    return () => clearInterval(t);
  }, []);
  const lines: string[] = [];
  const lostFor = liveStore.closedAt ? Math.max(0, now - liveStore.closedAt) : 0;
  // a short blip while reconnecting is not worth a banner
  if (connection === 'closed' && lostFor > 4000)
    lines.push(`Link to the server lost ${durationWords(lostFor)} ago: values shown may be old. Reconnecting…`);
  else if (health && health.status !== 'ok') {
    for (const p of health.parts)
      if (p.state !== 'ok') lines.push(p.message.charAt(0).toUpperCase() + p.message.slice(1));
  }
  if (!lines.length) return null;
  const down = connection === 'closed' || health?.status === 'down';
  return (
    <View
      role="status"
      aria-live="polite"
      style={{
        backgroundColor: down ? palette.linkLost : palette.advisoryBg,
        paddingHorizontal: space.lg,
        paddingVertical: space.xs,
      }}
    >
      <Text variant="small" strong style={{ color: down ? palette.onLinkLost : palette.advisory }}>
        {lines.join(' · ')}
      </Text>
    </View>
  );
}
