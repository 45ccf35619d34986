import { type QueryClient, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';

import type { Antenna, AntennaInput, Placement, Site, SiteInput } from '@/telemetry/api';

import { api } from './api-client';
import { connectLive, liveStore } from './live';
import { keys, staleTimes } from './query-keys';

/** After any change to the network, everything that lists sites, antennas or controllers fetches again. */
export const refreshNetwork = (qc: QueryClient) =>
  Promise.all([
    qc.invalidateQueries({ queryKey: keys.sites.all }),
    qc.invalidateQueries({ queryKey: keys.board }),
    qc.invalidateQueries({ queryKey: keys.controllers.all }),
  ]);

/** Changes made by anyone else arrive as a "network" message on /live. */
function useNetworkChanges() {
  const qc = useQueryClient();
  useEffect(() => connectLive(), []);
  useEffect(() => {
    const off = liveStore.onNetwork(() => void refreshNetwork(qc));
    return () => {
      off();
    };
  }, [qc]);
}

export function useSites(opts: { archived?: boolean } = {}) {
  useNetworkChanges();
  return useQuery({
    queryKey: opts.archived ? [...keys.sites.list(), 'archived'] : keys.sites.list(),
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ sites: Site[] }>(opts.archived ? '/sites?archived=1' : '/sites')).sites,
  });
}

export function useSite(id: number) {
  useNetworkChanges();
  return useQuery({
    queryKey: keys.sites.detail(id),
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ site: Site }>(`/sites/${id}`)).site,
  });
}

export function useRegions() {
  return useQuery({
    queryKey: [...keys.sites.all, 'regions'],
    queryFn: async () => (await api<{ regions: { name: string; sites: number }[] }>('/sites/regions')).regions,
  });
}

export function useFormerControllers(siteId: number) {
  return useQuery({
    queryKey: [...keys.sites.detail(siteId), 'former'],
    queryFn: async () =>
      (
        await api<{
          controllers: {
            id: number;
            serial: string;
            kind: string;
            antennaId: number | null;
            from: string | null;
            to: string | null;
          }[];
        }>(`/sites/${siteId}/former-controllers`)
      ).controllers,
  });
}

function useNetworkMutation<A, R>(fn: (args: A) => Promise<R>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: () => refreshNetwork(qc) });
}

export const useCreateSite = () =>
  useNetworkMutation((body: SiteInput & { antennas?: AntennaInput[] }) =>
    api<{ site: Site }>('/sites', { body }).then((r) => r.site),
  );
export const useUpdateSite = (id: number) =>
  useNetworkMutation((body: Partial<SiteInput>) =>
    api<{ site: Site }>(`/sites/${id}`, { method: 'PATCH', body }).then((r) => r.site),
  );
export const useArchiveSite = (id: number) =>
  useNetworkMutation((reason: string) =>
    api<{ site: Site }>(`/sites/${id}/archive`, { body: { reason } }).then((r) => r.site),
  );
export const useRestoreSite = (id: number) =>
  useNetworkMutation(() => api<{ site: Site }>(`/sites/${id}/restore`, { method: 'POST' }).then((r) => r.site));
export const useAddAntenna = (siteId: number) =>
  useNetworkMutation((body: AntennaInput) =>
    api<{ antenna: Antenna }>(`/sites/${siteId}/antennas`, { body }).then((r) => r.antenna),
  );
export const useUpdateAntenna = (siteId: number, antennaId: number) =>
  useNetworkMutation((body: Partial<AntennaInput>) =>
    api<{ antenna: Antenna }>(`/sites/${siteId}/antennas/${antennaId}`, { method: 'PATCH', body }).then(
      (r) => r.antenna,
    ),
  );
export const useArchiveAntenna = (siteId: number) =>
  useNetworkMutation(({ antennaId, reason }: { antennaId: number; reason: string }) =>
    api<{ antenna: Antenna }>(`/sites/${siteId}/antennas/${antennaId}/archive`, { body: { reason } }).then(
      (r) => r.antenna,
    ),
  );
export const useMoveController = (id: number) =>
  useNetworkMutation((body: { siteId: number; antennaId: number | null; note?: string }) =>
    api(`/controllers/${id}/move`, { body }),
  );

export function usePlacements(controllerId: number) {
  return useQuery({
    queryKey: [...keys.controllers.detail(controllerId), 'placements'],
    queryFn: async () => (await api<{ placements: Placement[] }>(`/controllers/${controllerId}/placements`)).placements,
  });
}
