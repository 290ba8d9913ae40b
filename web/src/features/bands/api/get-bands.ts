import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BandsResponse } from '@shared/schemas/bands';
import { api } from '../../../lib/api-client';
import { bandKeys } from './band-keys';

export function getBands(signal?: AbortSignal): Promise<BandsResponse> {
  return api.get<BandsResponse>('/api/bands', { signal });
}

export const bandsQueryOptions = () => queryOptions({ queryKey: bandKeys.list(), queryFn: ({ signal }) => getBands(signal), staleTime: 15_000 });

/** Bands of every tank, as ratio and as mV at the tank's current temperature, with any pending change. */
export function useBands() {
  return useQuery(bandsQueryOptions());
}
