import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ActiveAlarmsResponse } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { setServerTime } from '../../../lib/clock';
import { FALLBACK_POLL_MS, useIsLive } from '../../../lib/socket';
import { alarmKeys } from './alarm-keys';

export async function getActiveAlarms(signal?: AbortSignal): Promise<ActiveAlarmsResponse> {
  const res = await api.get<ActiveAlarmsResponse>('/api/alarms/active', { signal });
  setServerTime(res.serverTime);
  return res;
}

export const activeAlarmsQueryOptions = () =>
  queryOptions({ queryKey: alarmKeys.active(), queryFn: ({ signal }) => getActiveAlarms(signal), staleTime: 30_000 });

/** Every open alarm; one list shared by the header, the Floor and the Alarm desk. Polled only while the socket is down. */
export function useActiveAlarms() {
  const live = useIsLive();
  return useQuery({ ...activeAlarmsQueryOptions(), refetchInterval: live ? false : FALLBACK_POLL_MS });
}
