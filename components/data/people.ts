import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';

import type { NotificationPrefs, Person } from '@/telemetry/api';
import type { Role } from '@/telemetry/roles';

import { api } from './api-client';
import { keys, staleTimes } from './query-keys';

export function usePeople() {
  return useQuery({
    queryKey: keys.people.all,
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ people: Person[] }>('/people')).people,
  });
}

function usePeopleMutation<V>(fn: (v: V) => Promise<unknown>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSuccess: () => qc.invalidateQueries({ queryKey: keys.people.all }) });
}

export const useInvite = () =>
  usePeopleMutation((v: { email: string; name: string; role: Role }) => api('/people/invite', { body: v }));
export const useSendReset = () =>
  usePeopleMutation((id: number) => api<{ message: string }>(`/people/${id}/reset`, { method: 'POST' }));
export const useUpdatePerson = () =>
  usePeopleMutation((v: { id: number; patch: Partial<{ role: Role; active: boolean }> }) =>
    api(`/people/${v.id}`, { method: 'PATCH', body: v.patch }),
  );

export type OnCallEntry = { id: number; name: string; email: string; role: Role; position: number };
export function useOnCall(siteId: number | null) {
  return useQuery({
    queryKey: ['on-call', siteId],
    enabled: siteId != null,
    queryFn: async () => (await api<{ onCall: OnCallEntry[] }>(`/sites/${siteId}/on-call`)).onCall,
  });
}
export function useSetOnCall(siteId: number | null) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (personIds: number[]) =>
      api<{ onCall: OnCallEntry[] }>(`/sites/${siteId}/on-call`, { method: 'PUT', body: { personIds } }),
    onSuccess: (r) => qc.setQueryData(['on-call', siteId], r.onCall),
  });
}

export function usePrefs() {
  return useQuery({
    queryKey: ['prefs'],
    queryFn: async () => (await api<{ prefs: NotificationPrefs }>('/people/me/notifications')).prefs,
  });
}
export function useSetPrefs() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (p: NotificationPrefs) =>
      api<{ prefs: NotificationPrefs }>('/people/me/notifications', { method: 'PUT', body: p }),
    onSuccess: (r) => qc.setQueryData(['prefs'], r.prefs),
  });
}
