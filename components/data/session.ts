import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';

import type { Person, SignInBody } from '@/telemetry/api';

import { api, ApiFailure } from './api-client';
import { keys, staleTimes } from './query-keys';

export function useMe() {
  return useQuery({
    queryKey: keys.me,
    staleTime: staleTimes.reference,
    retry: false,
    queryFn: async () => {
      try {
        return (await api<{ person: Person }>('/auth/me')).person;
      } catch (e) {
        if (e instanceof ApiFailure && e.status === 401) return null;
        throw e;
      }
    },
  });
}

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SignInBody) => api<{ person: Person }>('/auth/sign-in', { body }),
    onSuccess: (r) => qc.setQueryData(keys.me, r.person),
  });
}

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<void>('/auth/sign-out', { method: 'POST' }),
    onSettled: () => {
      // "no one" first, on the query the layout is watching (clearing the cache first would
      // detach it, and the screen would stay as it was); then everyone else's data goes
      qc.setQueryData(keys.me, null);
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== keys.me[0] });
    },
  });
}
