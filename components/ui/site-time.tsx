import { useState } from 'react';
import { Pressable } from 'react-native';

import { useSites } from '@/components/data/sites';
import { formatTime, type TimeStyle } from '@/telemetry/time';

import { Text } from './text';

/** The zone a site keeps its times in; the viewer's own until the sites have loaded. */
export function useSiteZone(siteId: number | null | undefined): string | undefined {
  const sites = useSites({ archived: true });
  return sites.data?.find((s) => s.id === siteId)?.timeZone;
}

/**
 * A time at a site, in the site's zone and saying so; hovering (or a tap on a
 * phone) shows the same instant in the viewer's own zone.
 */
export function SiteTime({
  at,
  timeZone,
  style = {},
  variant,
}: {
  at: string | number | Date;
  timeZone: string | undefined;
  style?: Omit<TimeStyle, 'timeZone'>;
  variant?: 'small' | 'body';
}) {
  const [mine, setMine] = useState(false);
  const site = formatTime(at, { ...style, timeZone });
  const viewer = formatTime(at, style);
  const same = site === viewer;
  return (
    <Pressable
      onPress={() => setMine(!mine)}
      onHoverIn={() => setMine(true)}
      onHoverOut={() => setMine(false)}
      disabled={same}
      aria-label={same ? site : `${site} at the site, ${viewer} here`}
      style={{ alignSelf: 'flex-start' }}
    >
      <Text
        variant={variant}
        style={same ? undefined : { textDecorationLine: 'underline', textDecorationStyle: 'dotted' }}
      >
        {mine && !same ? `${viewer} (your time)` : site}
      </Text>
    </Pressable>
  );
}
