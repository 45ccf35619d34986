import { useQuery } from '@tanstack/react-query';
import type { Person } from '../../telemetry/api';
import { api } from './api-client';
import { keys, staleTimes } from './query-keys';

export function usePeople() {
  return useQuery({
    queryKey: keys.people.all,
    staleTime: staleTimes.reference,
    queryFn: async () => (await api<{ people: Person[] }>('/people')).people,
  });
}
