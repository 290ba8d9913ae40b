import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { TrendResponse } from '@shared/schemas/plant';
import { api, withQuery } from '../../../lib/api-client';
import { serverNow } from '../../../lib/clock';
import { FALLBACK_POLL_MS, useIsLive } from '../../../lib/socket';
import { tankKeys } from './tank-keys';

export const PRESETS = { '1h': 3_600, '8h': 8 * 3_600, '24h': 24 * 3_600, '7d': 7 * 86_400, '30d': 30 * 86_400 } as const;
export type Preset = keyof typeof PRESETS;
export type TrendRange = { kind: 'preset'; preset: Preset } | { kind: 'custom'; from: string; to: string };

/** About one point per horizontal pixel of a wide chart. */
const MAX_POINTS = 1500;

export const rangeKey = (range: TrendRange) => (range.kind === 'preset' ? range.preset : `${range.from}/${range.to}`);

/** Presets end "now" (server clock), so they can take the live tail. */
export function windowOf(range: TrendRange): { from: string; to: string } {
  if (range.kind === 'custom') return { from: range.from, to: range.to };
  const to = serverNow();
  return { from: new Date(to - PRESETS[range.preset] * 1000).toISOString(), to: new Date(to).toISOString() };
}

export function getTrend(tankId: number, range: TrendRange, signal?: AbortSignal): Promise<TrendResponse> {
  const { from, to } = windowOf(range);
  return api.get<TrendResponse>(withQuery(`/api/tanks/${tankId}/trend`, { from, to, maxPoints: MAX_POINTS }), { signal });
}

export const trendQueryOptions = (tankId: number, range: TrendRange) =>
  queryOptions({
    queryKey: tankKeys.trend(tankId, rangeKey(range)),
    queryFn: ({ signal }) => getTrend(tankId, range, signal),
    // A preset is kept current by the live tail; a custom range never changes.
    staleTime: Infinity,
  });

export function useTrend(tankId: number, range: TrendRange) {
  const live = useIsLive();
  return useQuery({
    ...trendQueryOptions(tankId, range),
    placeholderData: keepPreviousData,
    refetchInterval: range.kind === 'preset' && !live ? FALLBACK_POLL_MS : false,
  });
}
