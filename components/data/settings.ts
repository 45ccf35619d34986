import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';

import type { Settings } from '@/telemetry/api';

import { api } from './api-client';
import { staleTimes } from './query-keys';

export function useSettings() {
  return useQuery({
    queryKey: ['settings'],
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ settings: Settings }>('/settings')).settings,
  });
}

export function useSaveSettings() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (s: Settings) => api<{ settings: Settings }>('/settings', { method: 'PUT', body: s }),
    onSuccess: (r) => qc.setQueryData(['settings'], r.settings),
  });
}
