import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';

import { api } from './api-client';
import { connectLive, liveStore } from './live';

export type Visit = {
  id: number;
  siteId: number;
  site: string;
  personId: number;
  person: string;
  checkedInAt: string;
  checkedOutAt: string | null;
  /** when they expect to leave, if they said */
  expectedOutAt: string | null;
  hazard: boolean;
  hazardRadiusM: number | null;
  note: string | null;
};
export type Hazard = {
  present: boolean;
  icing: boolean;
  shedding: boolean;
  reason: string;
  radiusM: number | null;
  towerHeightM: number;
  windMs: number;
  assumptions: string[];
};

export function useOpenVisits() {
  const qc = useQueryClient();
  useEffect(() => connectLive(), []);
  useEffect(() => {
    const off = liveStore.onVisit(() => void qc.invalidateQueries({ queryKey: ['visits'] }));
    return () => {
      off();
    };
  }, [qc]);
  return useQuery({
    queryKey: ['visits', 'open'],
    queryFn: async () => (await api<{ visits: Visit[] }>('/visits?open=1')).visits,
  });
}

export function useHazard(siteId: number | null) {
  return useQuery({
    queryKey: ['hazard', siteId],
    enabled: siteId != null,
    refetchInterval: 30_000,
    queryFn: async () => (await api<{ hazard: Hazard }>(`/sites/${siteId}/hazard`)).hazard,
  });
}

export function useCheckIn(siteId: number | null) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { checklist?: Record<string, boolean>; note?: string; stayMinutes?: number }) =>
      api<{ id: number; hazard: Hazard }>(`/visits/site/${siteId}`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['visits'] }),
  });
}

export function useCheckOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api(`/visits/${id}/check-out`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ['visits'] }),
  });
}
