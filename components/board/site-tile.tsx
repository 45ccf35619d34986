import { Link } from 'expo-router';
import { memo } from 'react';
import { StyleSheet, View } from 'react-native';
import type { Site } from '../../telemetry/api';
import { palette } from '../theme/palette';
import { radius, size, space } from '../theme/tokens';
import { Badge } from '../ui/badge';
import { Text } from '../ui/text';

const powerWords = { utility: 'Mains', solar: 'Solar, off-grid', generator: 'Generator' } as const;

export const SiteTile = memo(function SiteTile({ site, wall }: { site: Site; wall: boolean }) {
  return (
    <Link href={`/sites/${site.id}`} style={styles.tile} aria-label={`Site ${site.name}`}>
      <View style={styles.inner}>
        <View style={styles.row}>
          <Text variant={wall ? 'title' : 'body'} strong>{site.name}</Text>
          <Badge label={site.code} />
        </View>
        <Text variant="small" muted>{powerWords[site.powerSource]}{site.batteryKwh ? ` · battery ${site.batteryKwh} kWh` : ''} · tower {site.towerHeightM} m</Text>
        <Text variant="small" muted>{site.antennas.map((a) => a.name).join(' · ')}</Text>
      </View>
    </Link>
  );
});

const styles = StyleSheet.create({
  tile: { backgroundColor: palette.surface, borderRadius: radius.md, borderWidth: size.borderWidth, borderColor: palette.border, padding: space.md },
  inner: { gap: space.xs },
  row: { flexDirection: 'row', justifyContent: 'space-between', alignItems: 'center', gap: space.sm },
});
