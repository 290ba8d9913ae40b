import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProbeFreshness } from '@shared/schemas/socket-events';
import { plantKeys } from '../api/plant-keys';

export type FreshnessByProbe = Record<number, ProbeFreshness>;

/** Not fetched: the socket fills it (see use-plant-live-sync); starts empty. */
export const probeFreshnessOptions = () =>
  queryOptions({
    queryKey: plantKeys.freshness(),
    queryFn: (): FreshnessByProbe => ({}),
    staleTime: Infinity,
    gcTime: Infinity,
  });

export function useProbeFreshness(): FreshnessByProbe {
  return useQuery(probeFreshnessOptions()).data ?? {};
}
