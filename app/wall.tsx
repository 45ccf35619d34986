import { Link, Redirect } from 'expo-router';
import { ScrollView, View } from 'react-native';

import { Board } from '@/components/board/board';
import { WallHeader } from '@/components/board/wall-header';
import { useBoard } from '@/components/data/board';
import { useMe } from '@/components/data/session';
import { useSites } from '@/components/data/sites';
import { useLayout } from '@/components/theme/breakpoints';
import { palette } from '@/components/theme/palette';
import { space } from '@/components/theme/tokens';
import { QueryState } from '@/components/ui/query-state';
import { Text, TypeScale } from '@/components/ui/text';

/**
 * Wall mode: no navigation, no title, no Sign out; the alarm counts, a clock and
 * the data's age on top, and every site in a layout whose positions never move.
 * Type grows with the screen: 1× at 1920 px wide, 2× at 3840.
 */
export default function WallRoute() {
  const me = useMe();
  const { width } = useLayout();
  const scale = Math.min(2.2, Math.max(1, width / 1920));
  if (me.isPending) return null;
  if (!me.data) return <Redirect href="/sign-in?next=%2Fwall" />;
  return (
    <TypeScale.Provider value={scale}>
      <View style={{ flex: 1, backgroundColor: palette.background }}>
        <WallHeader scale={scale} />
        <SitesOnWall />
        <View style={{ position: 'absolute', right: space.sm, bottom: space.xs, opacity: 0.6 }}>
          <Link href="/">
            <Text variant="small" muted>
              Leave wall mode
            </Text>
          </Link>
        </View>
      </View>
    </TypeScale.Provider>
  );
}

function SitesOnWall() {
  const sites = useSites();
  // the snapshot that seeds the live values
  useBoard();
  return (
    <ScrollView style={{ flex: 1 }} contentContainerStyle={{ padding: space.lg }}>
      <QueryState query={sites}>{(list) => <Board sites={list} order={0} mode="stable" scaled />}</QueryState>
    </ScrollView>
  );
}
