import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AlarmEventView, AlarmView } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

export type AlarmDetail = { alarm: AlarmView; timeline: AlarmEventView[] };

export const getAlarm = (id: number, signal?: AbortSignal) => api.get<AlarmDetail>(`/api/alarms/instances/${id}`, { signal });

export const alarmQueryOptions = (id: number) => queryOptions({ queryKey: alarmKeys.detail(id), queryFn: ({ signal }) => getAlarm(id, signal) });

/** One alarm with its whole timeline (the socket sync refreshes it when an event for it arrives). */
export function useAlarm(id: number | null) {
  return useQuery({ ...alarmQueryOptions(id ?? 0), enabled: id !== null });
}
