import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrendResponse } from '@shared/schemas/plant';
import { api, withQuery } from '../../../lib/api-client';
import { serverNow } from '../../../lib/clock';
import { plantKeys } from './plant-keys';

/** The tile sparkline shows the last hour, one point a minute. */
export const RECENT_MS = 3_600_000;
const POINTS = 60;
// The window slides by refetching now and then; readings in between come from the live tile value.
const REFRESH_MS = 5 * 60_000;

export function getRecentTrend(tankId: number, signal?: AbortSignal): Promise<TrendResponse> {
  const to = serverNow();
  const range = { from: new Date(to - RECENT_MS).toISOString(), to: new Date(to).toISOString(), maxPoints: POINTS };
  return api.get<TrendResponse>(withQuery(`/api/tanks/${tankId}/trend`, range), { signal });
}

export const recentTrendQueryOptions = (tankId: number) =>
  queryOptions({
    queryKey: plantKeys.recent(tankId),
    queryFn: ({ signal }) => getRecentTrend(tankId, signal),
    staleTime: REFRESH_MS,
    refetchInterval: REFRESH_MS,
  });

export function useRecentTrend(tankId: number) {
  return useQuery(recentTrendQueryOptions(tankId));
}
