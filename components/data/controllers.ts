import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';

import type { Calibration, Controller, ControllerCreate, ControllerCredentials } from '@/telemetry/api';

import { api } from './api-client';
import { keys, staleTimes } from './query-keys';

export type ControllerDetail = Controller & {
  outOfService: boolean;
  lastRejects: { at: string; reason: string; payload: string }[];
};

export function useControllers() {
  return useQuery({
    queryKey: keys.controllers.list(),
    staleTime: staleTimes.live,
    queryFn: async () => (await api<{ controllers: Controller[] }>('/controllers')).controllers,
  });
}

export function useController(id: number) {
  return useQuery({
    queryKey: keys.controllers.detail(id),
    staleTime: 0,
    // an enrolled controller waiting for its first message is watched closely
    refetchInterval: (q) => (q.state.data?.status === 'waiting' ? 1500 : 10_000),
    queryFn: async () => (await api<{ controller: ControllerDetail }>(`/controllers/${id}`)).controller,
  });
}

export function useEnrol() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ControllerCreate) => api<ControllerCredentials>('/controllers', { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.controllers.all }),
  });
}

export function useRotatePassword(id: number) {
  return useMutation({
    mutationFn: () => api<ControllerCredentials>(`/controllers/${id}/password`, { method: 'POST' }),
  });
}

export function useCalibrate(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: Calibration) =>
      api<{ controller: Controller }>(`/controllers/${id}/calibration`, { method: 'PUT', body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.controllers.all }),
  });
}

export function useDecommission(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ controller: Controller }>(`/controllers/${id}/decommission`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.controllers.all }),
  });
}

export function useSetService(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { outOfService: boolean; reason: string }) => api(`/controllers/${id}/service`, { body: v }),
    onSuccess: () => qc.invalidateQueries({ queryKey: keys.controllers.all }),
  });
}
