import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RecentReading, TankSummary } from '@shared/schemas/plant';
import { api } from '../../../lib/api-client';
import { FALLBACK_POLL_MS, useIsLive } from '../../../lib/socket';
import { tankKeys } from './tank-keys';

export type TankDetail = {
  tank: TankSummary;
  site: { id: number; tag: string; name: string; timeZone: string };
  circuit: { id: number; tag: string; name: string };
  /** Newest stored readings with their calibration versions. */
  recent?: RecentReading[];
};

export function getTank(id: number, signal?: AbortSignal): Promise<TankDetail> {
  return api.get<TankDetail>(`/api/tanks/${id}`, { signal });
}

export const tankQueryOptions = (id: number) =>
  queryOptions({ queryKey: tankKeys.detail(id), queryFn: ({ signal }) => getTank(id, signal), staleTime: 30_000 });

/** One tank with site and circuit; kept live by use-tank-live, polled only while the socket is down. */
export function useTank(id: number) {
  const live = useIsLive();
  return useQuery({ ...tankQueryOptions(id), refetchInterval: live ? false : FALLBACK_POLL_MS });
}
