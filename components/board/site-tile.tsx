import { Link } from 'expo-router';
import { memo, useState } from 'react';
import { StyleSheet, View } from 'react-native';

import { kindWords, prioritySign, priorityTone, stateWords } from '@/components/alarms/words';
import { useLiveConnection, useSiteLive } from '@/components/data/live';
import { palette, toneColours } from '@/components/theme/palette';
import { radius, size, space } from '@/components/theme/tokens';
import { Badge, type Tone } from '@/components/ui/badge';
import { Text } from '@/components/ui/text';
import { awaitsAck } from '@/telemetry/alarms/machine';
import { defaultPriority } from '@/telemetry/alarms/rules';
import type { Site } from '@/telemetry/api';
import { type AntennaRow, antennaRows, type SiteCondition, siteCondition } from '@/telemetry/board';
import { vswrWords } from '@/telemetry/math/rf';
import { formatClock } from '@/telemetry/time';

import { Sparkline } from './sparkline';

const powerWords = { utility: 'Mains', solar: 'Solar', generator: 'Generator' } as const;
export const icingWords = {
  none: 'No icing',
  possible: 'Icing possible',
  likely: 'Icing likely',
  active: 'Icing now',
} as const;

export function tileTone(c: SiteCondition, rows: AntennaRow[] = []): Tone {
  if (c.vswrLevel === 'trip') return 'critical';
  if (c.silent) return 'silent';
  if (c.vswrLevel === 'warning') return 'high';
  if (c.heaterOffWhileIcing) return 'medium';
  if ((c.batteryPct != null && c.batteryPct < 30) || rows.some((r) => r.heater?.weak)) return 'advisory';
  return 'neutral';
}

const rowTone = (r: AntennaRow): Tone =>
  r.level === 'trip'
    ? 'critical'
    : r.silent
      ? 'silent'
      : r.level === 'warning'
        ? 'high'
        : r.heater?.weak
          ? 'advisory'
          : 'neutral';

const amps = (a: number | null) => (a == null ? '–' : a.toFixed(1));

/** One antenna's line on a tile: its VSWR against its own limits, its trend, and its heater's current against rated. */
function AntennaLine({
  row,
  many,
  wall,
  xl,
  width,
  greyed,
  tone,
}: {
  row: AntennaRow | null;
  many: boolean;
  wall: boolean;
  xl: boolean;
  width: number;
  greyed: boolean;
  tone: Tone;
}) {
  const figure = many
    ? xl
      ? 'wallTitleXL'
      : wall
        ? 'wallFigure'
        : 'title'
    : xl
      ? 'wallFigureXL'
      : wall
        ? 'wallFigure'
        : 'figure';
  const limits = row?.limits;
  const h = row?.heater;
  return (
    <View aria-label={row ? `Antenna ${row.name}` : undefined} style={many ? styles.antenna : undefined}>
      <View style={styles.row}>
        <View style={{ flexShrink: 1 }}>
          {many && row ? (
            <Text variant="small" strong numberOfLines={1}>
              {row.name}
            </Text>
          ) : null}
          <Text
            variant={figure}
            strong
            style={{
              color: greyed
                ? palette.textMuted
                : tone !== 'neutral' && tone !== 'silent'
                  ? toneColour(tone)
                  : palette.text,
            }}
            aria-label={`VSWR ${row?.vswr?.toFixed(2) ?? 'no reading'}`}
          >
            {vswrWords(row?.vswr)}
          </Text>
        </View>
        {limits && (limits.warning != null || limits.trip != null) ? (
          <Text variant="small" muted style={{ textAlign: 'right' }}>
            {limits.warning != null ? `limit ${vswrWords(limits.warning)}` : ''}
            {limits.warning != null && limits.trip != null ? '\n' : ''}
            {limits.trip != null ? `trip ${vswrWords(limits.trip)}` : ''}
          </Text>
        ) : null}
      </View>
      <Sparkline points={row?.trend ?? []} width={width} warning={limits?.warning ?? null} tone={toneColour(tone)} />
      {h ? (
        <Text variant="small" style={{ color: h.weak ? palette.advisory : palette.textMuted }}>
          {h.weak ? '⚑ ' : ''}Heater {h.on ? 'on' : 'off'}
          {h.on || (h.currentA ?? 0) > 0
            ? ` · ${amps(h.currentA)} A${h.ratedA != null ? ` of ${h.ratedA.toFixed(1)} A rated` : ''}`
            : ''}
          {h.weak ? ' — not heating' : ''}
        </Text>
      ) : null}
    </View>
  );
}

/** The frame's shape says the state as well as its colour: solid and thick at trip, dashed high, dotted silent. */
const frame: Record<Tone, { borderWidth: number; borderStyle: 'solid' | 'dashed' | 'dotted' }> = {
  neutral: { borderWidth: size.borderWidth, borderStyle: 'solid' },
  critical: { borderWidth: size.focusWidth + 2, borderStyle: 'solid' },
  high: { borderWidth: size.focusWidth, borderStyle: 'dashed' },
  medium: { borderWidth: size.focusWidth - 1, borderStyle: 'solid' },
  low: { borderWidth: size.focusWidth - 1, borderStyle: 'solid' },
  silent: { borderWidth: size.focusWidth, borderStyle: 'dotted' },
  advisory: { borderWidth: size.focusWidth - 1, borderStyle: 'dashed' },
  invalid: { borderWidth: size.focusWidth - 1, borderStyle: 'solid' },
  confirmed: { borderWidth: size.borderWidth, borderStyle: 'solid' },
  hazard: { borderWidth: size.focusWidth, borderStyle: 'solid' },
};

/** A tile's frame and trace: grey at rest, else the colour of what it means. */
export const toneColour = (tone: Tone) => (tone === 'neutral' ? palette.trace : toneColours(tone).fg);

/** One site: subscribed to its own live values only, so one reading redraws one tile. */
export const SiteTile = memo(function SiteTile({
  site,
  wall,
  xl = false,
  alarmKind,
  alarmPriority,
  alarmState,
  alarmCount = 0,
  onSite,
}: {
  site: Site;
  wall: boolean;
  xl?: boolean;
  alarmKind?: string;
  alarmPriority?: string;
  alarmState?: string;
  /** every open alarm at the site, the worst one included */
  alarmCount?: number;
  onSite?: { words: string; overdue: boolean };
}) {
  const live = useSiteLive(site.id);
  const [width, setWidth] = useState(0);
  const controllers = live?.controllers ?? [];
  const c = siteCondition(controllers);
  const rows = antennaRows(site.antennas, controllers);
  const tone = tileTone(c, rows);
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
      style={[styles.tile, abnormal && { borderColor: toneColour(tone), ...frame[tone] }]}
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
          <Text variant="small" muted>
            {rows.length > 1 ? `${rows.length} antennas, VSWR at each` : 'VSWR at antenna'}
          </Text>
          <View style={{ alignItems: 'flex-end' }}>
            <Text variant={xl ? 'wallTitleXL' : wall ? 'title' : 'body'}>
              {c.airTempC != null ? `${c.airTempC.toFixed(1)} °C` : '–'}
            </Text>
            <Text variant="small" muted>
              {c.moisture == null ? '' : c.moisture ? 'Wet' : 'Dry'}
            </Text>
          </View>
        </View>
        {(rows.length ? rows : [null]).map((r, i) => (
          <AntennaLine
            key={r?.antennaId ?? `site-${i}`}
            row={r}
            many={rows.length > 1}
            wall={wall}
            xl={xl}
            width={width}
            greyed={linkDown}
            tone={r ? rowTone(r) : 'neutral'}
          />
        ))}
        {alarmKind ? (
          <View style={styles.badges} aria-label="Worst open alarm">
            <Badge
              label={`${prioritySign(alarmPriority ?? 'low')} ${kindWords[alarmKind] ?? alarmKind}`}
              tone={priorityTone(alarmPriority ?? 'low')}
            />
            <Badge
              label={stateWords[alarmState ?? ''] ?? alarmState ?? ''}
              tone={awaitsAck(alarmState) ? priorityTone(alarmPriority ?? 'low') : 'neutral'}
            />
            {alarmCount > 1 ? <Badge label={`+${alarmCount - 1} more open`} /> : null}
          </View>
        ) : null}
        {onSite ? (
          <Badge
            label={`${onSite.overdue ? '⚑ ' : ''}On site: ${onSite.words}`}
            tone={onSite.overdue ? 'advisory' : 'neutral'}
          />
        ) : null}
        <View style={styles.badges}>
          {linkDown ? <Badge label={`Last heard ${formatClock(c.lastTs!)}`} /> : null}
          {c.silent ? <Badge label="Silent" tone="silent" /> : null}
          {c.waiting ? <Badge label="Waiting for first message" /> : null}
          {c.vswrLevel !== 'normal' && !alarmSaysIt ? (
            // the colour of the alarm this level raises, whatever else the tile's frame says
            <Badge
              label={c.vswrLevel === 'trip' ? 'VSWR trip level' : 'VSWR high'}
              tone={priorityTone(defaultPriority(c.vswrLevel === 'trip' ? 'vswr-trip' : 'vswr-warning'))}
            />
          ) : null}
          {c.heaterOffWhileIcing ? <Badge label="Heater off while icing" tone="medium" /> : null}
          {c.lastTs ? <Badge label={icingWords[c.icing]} /> : null}
          <Badge
            label={`${powerWords[site.powerSource]}${c.batteryPct != null ? ` ${Math.round(c.batteryPct)} %` : ''}`}
            tone={c.batteryPct != null && c.batteryPct < 30 ? 'advisory' : 'neutral'}
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
  antenna: { borderTopWidth: size.borderWidth, borderColor: palette.surfaceMuted, paddingTop: space.xs },
  badges: { flexDirection: 'row', flexWrap: 'wrap', gap: space.xs },
});
