import { useEffect, useState } from 'react';
import { Board } from '../../components/board/board';
import { BoardActions } from '../../components/board/board-actions';
import { useBoard } from '../../components/data/board';
import { useSites } from '../../components/data/sites';
import { QueryState } from '../../components/ui/query-state';
import { Screen } from '../../components/ui/screen';

/** Re-sort by attention every 15 s: often enough to surface trouble, calm enough to read. */
const resortMs = 15_000;

export default function BoardRoute() {
  const sites = useSites();
  const board = useBoard();
  const [order, setOrder] = useState(0);
  useEffect(() => {
    const t = setInterval(() => setOrder((n) => n + 1), resortMs);
    return () => clearInterval(t);
  }, []);
  useEffect(() => setOrder((n) => n + 1), [board.data]);
  return (
    <Screen title="Board" full actions={<BoardActions />}>
      <QueryState query={sites}>{(list) => <Board sites={list} order={order} />}</QueryState>
    </Screen>
  );
}
