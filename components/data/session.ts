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
      qc.clear();
      qc.setQueryData(keys.me, null);
    },
  });
}
