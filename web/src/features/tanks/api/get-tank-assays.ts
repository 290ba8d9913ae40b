import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AssaysResponse } from '@shared/schemas/assays';
import { api, withQuery } from '../../../lib/api-client';
import { rangeKey, windowOf, type TrendRange } from './get-trend';
import { tankKeys } from './tank-keys';

/** A lab result drawn on the ratio chart: sampling time (s) and the lab's Fe³⁺/Fe²⁺. */
export type AssayPoint = { t: number; labRatio: number };

export async function getTankAssays(tankId: number, range: TrendRange, signal?: AbortSignal): Promise<AssayPoint[]> {
  const { from, to } = windowOf(range);
  const res = await api.get<AssaysResponse>(withQuery('/api/assays', { tankId, from, to, limit: 500 }), { signal });
  return res.assays.flatMap((a) => (a.labRatio != null && !a.retracted ? [{ t: Date.parse(a.sampledAt) / 1000, labRatio: a.labRatio }] : []));
}

export const tankAssaysQueryOptions = (tankId: number, range: TrendRange) =>
  queryOptions({
    queryKey: tankKeys.assays(tankId, rangeKey(range)),
    queryFn: ({ signal }) => getTankAssays(tankId, range, signal),
    // Lab results arrive hours after sampling; a few minutes old is fine.
    staleTime: 5 * 60_000,
  });

export function useTankAssays(tankId: number, range: TrendRange) {
  return useQuery({ ...tankAssaysQueryOptions(tankId, range), placeholderData: keepPreviousData });
}
