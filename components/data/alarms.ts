import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';

import type { AckManyResult, AlarmDetail, AlarmView } from '@/telemetry/api';

import { api } from './api-client';
import { connectLive, liveStore } from './live';
import { keys } from './query-keys';

export type { AlarmDetail } from '@/telemetry/api';

/** Alarm changes arrive on /live; the lists refetch at once. */
export function useAlarmsLive() {
  const qc = useQueryClient();
  useEffect(() => connectLive(), []);
  useEffect(() => {
    const off = liveStore.onAlarm(() => void qc.invalidateQueries({ queryKey: keys.alarms.all }));
    return () => {
      off();
    };
  }, [qc]);
}

export function useAlarms(filter: { open?: '0' | '1'; site?: string; priority?: string; state?: string }) {
  useAlarmsLive();
  const params = new URLSearchParams(Object.entries(filter).filter(([, v]) => v) as [string, string][]).toString();
  return useQuery({
    queryKey: keys.alarms.list(filter),
    staleTime: 5_000,
    queryFn: async () => (await api<{ alarms: AlarmView[] }>(`/alarms?${params}`)).alarms,
  });
}

export function useAlarm(id: number) {
  useAlarmsLive();
  return useQuery({
    queryKey: keys.alarms.detail(id),
    queryFn: async () => (await api<{ alarm: AlarmDetail }>(`/alarms/${id}`)).alarm,
  });
}

function useAlarmMutation<V, R = unknown>(fn: (v: V) => Promise<R>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: fn, onSettled: () => qc.invalidateQueries({ queryKey: keys.alarms.all }) });
}

export function useAck(id: number) {
  return useAlarmMutation(async (v: { note: string; photo: Blob | null; photoName?: string }) => {
    const form = new FormData();
    if (v.note) form.append('note', v.note);
    if (v.photo) form.append('photo', v.photo, v.photoName ?? 'photo.jpg');
    return api(`/alarms/${id}/ack`, { form });
  });
}

export function useShelve(id: number) {
  return useAlarmMutation((v: { reason: string; until: string }) => api(`/alarms/${id}/shelve`, { body: v }));
}

export function useUnshelve(id: number) {
  return useAlarmMutation(() => api(`/alarms/${id}/unshelve`, { method: 'POST' }));
}

/** Acknowledges several alarms with one note; the answer names those acknowledged and those skipped. */
export function useAckMany() {
  return useAlarmMutation((v: { ids: number[]; note: string }) =>
    api<AckManyResult>('/alarms/ack', { body: { ids: v.ids, ...(v.note ? { note: v.note } : {}) } }),
  );
}
