import { Link } from 'expo-router';
import { memo, useState } from 'react';
import { StyleSheet, View } from 'react-native';

import { kindWords, prioritySign, priorityTone, stateWords } from '@/components/alarms/words';
import { useLiveConnection, useSiteLive } from '@/components/data/live';
import { palette } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';
import { Badge, type Tone } from '@/components/ui/badge';
import { Text } from '@/components/ui/text';
import type { Site } from '@/telemetry/api';
import { type SiteCondition, siteCondition } from '@/telemetry/board';
import { formatClock } from '@/telemetry/time';

import { Sparkline } from './sparkline';

const powerWords = { utility: 'Mains', solar: 'Solar', generator: 'Generator' } as const;
const icingWords = {
  none: 'No icing',
  possible: 'Icing possible',
  likely: 'Icing likely',
  active: 'Icing now',
} as const;

export function tileTone(c: SiteCondition): Tone {
  if (c.vswrLevel === 'trip') return 'critical';
  if (c.silent) return 'silent';
  if (c.vswrLevel === 'warning') return 'high';
  if (c.heaterOffWhileIcing || (c.batteryPct != null && c.batteryPct < 30)) return 'medium';
  return 'neutral';
}

/** The frame's shape says the state as well as its colour: solid and thick at trip, dashed high, dotted silent. */
const frame: Record<Tone, { borderWidth: number; borderStyle: 'solid' | 'dashed' | 'dotted' }> = {
  neutral: { borderWidth: size.borderWidth, borderStyle: 'solid' },
  critical: { borderWidth: size.focusWidth + 2, borderStyle: 'solid' },
  high: { borderWidth: size.focusWidth, borderStyle: 'dashed' },
  medium: { borderWidth: size.focusWidth - 1, borderStyle: 'solid' },
  low: { borderWidth: size.focusWidth - 1, borderStyle: 'solid' },
  silent: { borderWidth: size.focusWidth, borderStyle: 'dotted' },
};

export const toneColour: Record<Tone, string> = {
  neutral: palette.trace,
  critical: palette.critical,
  high: palette.high,
  medium: palette.medium,
  low: palette.low,
  silent: palette.silent,
};

/** One site: subscribed to its own live values only, so one reading redraws one tile. */
export const SiteTile = memo(function SiteTile({
  site,
  wall,
  xl = false,
  alarmKind,
  alarmPriority,
  alarmState,
  onSite,
}: {
  site: Site;
  wall: boolean;
  xl?: boolean;
  alarmKind?: string;
  alarmPriority?: string;
  alarmState?: string;
  onSite?: { words: string; overdue: boolean };
}) {
  const live = useSiteLive(site.id);
  const [width, setWidth] = useState(0);
  const controllers = live?.controllers ?? [];
  const c = siteCondition(controllers);
  const tone = tileTone(c);
  const trend = controllers.reduce<{ t: number; v: number | null }[]>(
    (best, x) => (x.trend.length > best.length ? x.trend : best),
    [],
  );
  const abnormal = tone !== 'neutral';
  // the alarm's chip already names the VSWR level: no second chip saying the same
  const alarmSaysIt =
    (alarmKind === 'vswr-trip' && c.vswrLevel === 'trip') ||
    (alarmKind === 'vswr-warning' && c.vswrLevel === 'warning');
  // with the link down the values are the last ones heard: greyed, with their time
  const linkDown = useLiveConnection() !== 'open' && c.lastTs != null;
  return (
    <Link
      href={`/sites/${site.id}`}
      style={[styles.tile, abnormal && { borderColor: toneColour[tone], ...frame[tone] }]}
      aria-label={`Site ${site.name}`}
    >
      <View style={styles.inner} onLayout={(e) => setWidth(e.nativeEvent.layout.width)}>
        <View style={styles.row}>
          <Text
            variant={xl ? 'wallTitleXL' : wall ? 'title' : 'body'}
            strong
            numberOfLines={1}
            style={{ flexShrink: 1 }}
          >
            {site.name}
          </Text>
          <Text variant="small" muted>
            {site.code}
          </Text>
        </View>
        <View style={styles.row}>
          <View>
            <Text variant="small" muted>
              VSWR at antenna
            </Text>
            <Text
              variant={xl ? 'wallFigureXL' : wall ? 'wallFigure' : 'figure'}
              strong
              style={{
                color: linkDown ? palette.textMuted : abnormal && tone !== 'silent' ? toneColour[tone] : palette.text,
              }}
              aria-label={`VSWR ${c.worstVswr?.toFixed(2) ?? 'no reading'}`}
            >
              {c.worstVswr != null ? c.worstVswr.toFixed(2) : '–'}
            </Text>
          </View>
          <View style={{ alignItems: 'flex-end' }}>
            <Text variant={xl ? 'wallTitleXL' : wall ? 'title' : 'body'}>
              {c.airTempC != null ? `${c.airTempC.toFixed(1)} °C` : '–'}
            </Text>
            <Text variant="small" muted>
              {c.moisture == null ? '' : c.moisture ? 'Wet' : 'Dry'}
            </Text>
          </View>
        </View>
        <Sparkline points={trend} width={width} warning={c.warning} tone={toneColour[tone]} />
        {alarmKind ? (
          <View style={styles.badges} aria-label="Worst open alarm">
            <Badge
              label={`${prioritySign(alarmPriority ?? 'low')} ${kindWords[alarmKind] ?? alarmKind}`}
              tone={priorityTone(alarmPriority ?? 'low')}
            />
            <Badge
              label={stateWords[alarmState ?? ''] ?? alarmState ?? ''}
              tone={
                alarmState === 'unacknowledged' || alarmState === 'rtn-unacknowledged'
                  ? priorityTone(alarmPriority ?? 'low')
                  : 'neutral'
              }
            />
          </View>
        ) : null}
        {onSite ? (
          <Badge
            label={`${onSite.overdue ? '◆ ' : ''}On site: ${onSite.words}`}
            tone={onSite.overdue ? 'medium' : 'neutral'}
          />
        ) : null}
        <View style={styles.badges}>
          {linkDown ? <Badge label={`Last heard ${formatClock(c.lastTs!)}`} /> : null}
          {c.silent ? <Badge label="Silent" tone="silent" /> : null}
          {c.waiting ? <Badge label="Waiting for first message" /> : null}
          {c.vswrLevel !== 'normal' && !alarmSaysIt ? (
            <Badge label={c.vswrLevel === 'trip' ? 'VSWR trip level' : 'VSWR high'} tone={tone} />
          ) : null}
          {c.heaterOffWhileIcing ? <Badge label="Heater off while icing" tone="medium" /> : null}
          {c.lastTs ? <Badge label={icingWords[c.icing]} /> : null}
          {c.lastTs ? <Badge label={c.heaterOn ? 'Heater on' : 'Heater off'} /> : null}
          <Badge
            label={`${powerWords[site.powerSource]}${c.batteryPct != null ? ` ${Math.round(c.batteryPct)} %` : ''}`}
            tone={c.batteryPct != null && c.batteryPct < 30 ? 'medium' : 'neutral'}
          />
        </View>
      </View>
    </Link>
  );
});

const styles = StyleSheet.create({
  tile: {
    display: 'flex',
    backgroundColor: palette.surface,
    borderRadius: radius.md,
    borderWidth: size.borderWidth,
    borderColor: palette.border,
    padding: space.md,
  },
  inner: { gap: space.xs, width: '100%' },
  row: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'flex-end', gap: space.sm },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
