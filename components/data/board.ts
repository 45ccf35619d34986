import { useQuery } from '@tanstack/react-query';
import { useEffect } from 'react';

import type { BoardSite } from '@/telemetry/board';

import { api } from './api-client';
import { connectLive, liveStore } from './live';
import { keys } from './query-keys';

/** The Board's first paint from the API, then /live keeps the store current. */
export function useBoard() {
  const q = useQuery({
    queryKey: keys.board,
    staleTime: 0,
    queryFn: async () => (await api<{ sites: BoardSite[] }>('/sites/board')).sites,
  });
  useEffect(() => {
    if (q.data) liveStore.seed(q.data);
  }, [q.data]);
  useEffect(() => connectLive(), []);
  return q;
}
