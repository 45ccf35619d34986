import { useQuery } from '@tanstack/react-query';
import type { Site } from '../../telemetry/api';
import { api } from './api-client';
import { keys, staleTimes } from './query-keys';

export function useSites() {
  return useQuery({
    queryKey: keys.sites.list(),
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ sites: Site[] }>('/sites')).sites,
  });
}

export function useSite(id: number) {
  return useQuery({
    queryKey: keys.sites.detail(id),
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ site: Site }>(`/sites/${id}`)).site,
  });
}
