import { useQuery } from '@tanstack/react-query';
import { geoConicConformal, geoPath, type GeoProjection } from 'd3-geo';
import { router } from 'expo-router';
import { memo, useMemo, useState } from 'react';
import { View } from 'react-native';
import Svg, { Circle, G, Path, Rect, Text as SvgText } from 'react-native-svg';
import { feature } from 'topojson-client';
import type { GeometryCollection, Topology } from 'topojson-specification';

import { tileTone, toneColour } from '@/components/board/site-tile';
import { useLiveConnection, useSiteLive } from '@/components/data/live';
import { palette } from '@/components/theme/palette';
import { font, space } from '@/components/theme/tokens';
import { Text } from '@/components/ui/text';
import type { Site } from '@/telemetry/api';
import { siteCondition } from '@/telemetry/board';

/** Country outlines, served by Thawline itself from the bundled atlas (1:50 million). */
function useOutlines() {
  return useQuery({
    queryKey: ['atlas', '50m'],
    staleTime: Infinity,
    gcTime: Infinity,
    queryFn: async () => {
      const topo = (await (await fetch('/atlas/countries-50m.json')).json()) as Topology<{
        countries: GeometryCollection;
      }>;
      return feature(topo, topo.objects.countries);
    },
  });
}

/** A projection that fits the sites with a margin; a single site gets a box of about 2° around it. */
function fitted(sites: Site[], width: number, height: number): GeoProjection {
  const lats = sites.map((s) => s.latitude);
  const lons = sites.map((s) => s.longitude);
  const pad = sites.length > 1 ? 0.6 : 1.5;
  const box = {
    type: 'MultiPoint' as const,
    coordinates: [
      [Math.min(...lons) - pad * 2, Math.min(...lats) - pad],
      [Math.max(...lons) + pad * 2, Math.max(...lats) + pad],
    ],
  };
  const midLat = (Math.min(...lats) + Math.max(...lats)) / 2;
  const midLon = (Math.min(...lons) + Math.max(...lons)) / 2;
  // a conformal conic centred on the network keeps small areas true in shape at any latitude
  return geoConicConformal()
    .rotate([-midLon, 0])
    .parallels([midLat - 2, midLat + 2])
    .fitExtent(
      [
        [space.lg, space.lg],
        [width - space.lg, height - space.lg],
      ],
      box,
    )
    .clipExtent([
      [0, 0],
      [width, height],
    ]);
}

/** One site: a small grey ring when all is well, a filled mark in the tile's colour when not. */
const SiteMark = memo(function SiteMark({
  site,
  x,
  y,
  big,
  alarmPriority,
}: {
  site: Site;
  x: number;
  y: number;
  big: boolean;
  alarmPriority?: string;
}) {
  const live = useSiteLive(site.id);
  const c = siteCondition(live?.controllers ?? []);
  const tone = alarmPriority === 'critical' ? 'critical' : tileTone(c);
  const abnormal = tone !== 'neutral';
  const stale = useLiveConnection() !== 'open';
  const r = (big ? 11 : 7) * (abnormal ? 1.3 : 1);
  const colour = stale ? palette.traceMuted : toneColour(tone);
  return (
    <G
      onPress={() => router.push(`/sites/${site.id}`)}
      accessibilityLabel={`${site.name}${abnormal ? ', needs attention' : ''}`}
    >
      <Circle cx={x} cy={y} r={r + 8} fill="transparent" />
      <Circle
        cx={x}
        cy={y}
        r={r}
        fill={abnormal ? colour : palette.surface}
        stroke={colour}
        strokeWidth={abnormal ? 3 : 2}
      />
      <SvgText
        x={x + r + 4}
        y={y + 4}
        fontSize={big ? 20 : 14}
        fontFamily={abnormal ? font.semibold : font.regular}
        fill={palette.text}
      >
        {site.code}
      </SvgText>
    </G>
  );
});

/**
 * The network on a map, drawn offline: country outlines from the bundled atlas,
 * sites by their coordinates, coloured only when abnormal, as the tiles are.
 */
export function NetworkMap({
  sites,
  height,
  big = false,
  worst,
}: {
  sites: Site[];
  height: number;
  big?: boolean;
  worst?: Map<number, { priority: string }>;
}) {
  const outlines = useOutlines();
  const [width, setWidth] = useState(0);
  const placed = useMemo(
    () => sites.filter((s) => Number.isFinite(s.latitude) && Number.isFinite(s.longitude)),
    [sites],
  );
  const projection = useMemo(
    () => (width && placed.length ? fitted(placed, width, height) : null),
    [width, height, placed],
  );
  const land = useMemo(
    () => (projection && outlines.data ? geoPath(projection)(outlines.data) : null),
    [projection, outlines.data],
  );
  return (
    <View
      onLayout={(e) => setWidth(Math.round(e.nativeEvent.layout.width))}
      style={{ width: '100%', height }}
      aria-label="Map of the sites"
      role="img"
    >
      {projection ? (
        <Svg width={width} height={height}>
          <Rect x={0} y={0} width={width} height={height} fill={palette.surfaceMuted} />
          {land ? <Path d={land} fill={palette.surface} stroke={palette.border} strokeWidth={1} /> : null}
          {placed.map((s) => {
            const p = projection([s.longitude, s.latitude]);
            return p ? (
              <SiteMark key={s.id} site={s} x={p[0]} y={p[1]} big={big} alarmPriority={worst?.get(s.id)?.priority} />
            ) : null;
          })}
        </Svg>
      ) : placed.length === 0 ? (
        <Text muted>No sites to show yet.</Text>
      ) : null}
      {outlines.isError ? (
        <Text variant="small" muted>
          Country outlines could not be loaded; sites are placed by their coordinates.
        </Text>
      ) : null}
    </View>
  );
}
