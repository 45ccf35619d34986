import { router, useLocalSearchParams } from 'expo-router';
import { useEffect, useState } from 'react';

import { Board, worstBySite } from '@/components/board/board';
import { BoardActions } from '@/components/board/board-actions';
import { useAlarms } from '@/components/data/alarms';
import { useBoard } from '@/components/data/board';
import { useSites } from '@/components/data/sites';
import { NetworkMap } from '@/components/map/network-map';
import { useLayout } from '@/components/theme/breakpoints';
import { Choice } from '@/components/ui/choice';
import { QueryState } from '@/components/ui/query-state';
import { Screen } from '@/components/ui/screen';

/** Re-sort by attention every 15 s: often enough to surface trouble, calm enough to read. */
const resortMs = 15_000;

function BoardMap({ sites }: { sites: Parameters<typeof NetworkMap>[0]['sites'] }) {
  const alarms = useAlarms({ open: '1' });
  const { layout, height } = useLayout();
  return (
    <NetworkMap
      sites={sites}
      height={Math.max(320, height - (layout === 'phone' ? 260 : 200))}
      big={layout === 'wall'}
      worst={worstBySite(alarms.data ?? [])}
    />
  );
}

export default function BoardRoute() {
  const sites = useSites();
  const board = useBoard();
  const params = useLocalSearchParams<{ view?: string }>();
  const view = params.view === 'map' ? 'map' : 'tiles';
  const [tick, setTick] = useState(0);
  useEffect(() => {
    const t = setInterval(() => setTick((n) => n + 1), resortMs);
    return () => clearInterval(t);
  }, []);
  // re-sorted every 15 s and whenever a fresh snapshot arrives
  const order = tick * 1e13 + board.dataUpdatedAt;
  return (
    <Screen title="Board" full actions={<BoardActions />}>
      <Choice
        label="View"
        value={view}
        onChange={(v) => router.setParams({ view: v === 'map' ? 'map' : undefined })}
        options={[
          { value: 'tiles', label: 'Tiles' },
          { value: 'map', label: 'Map' },
        ]}
      />
      <QueryState query={sites}>
        {(list) => (view === 'map' ? <BoardMap sites={list} /> : <Board sites={list} order={order} />)}
      </QueryState>
    </Screen>
  );
}
