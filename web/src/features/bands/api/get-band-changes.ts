import { queryOptions, useQuery } from '@tanstack/react-query';
import type { BandChange, BandChangesQuery } from '@shared/schemas/bands';
import { api, withQuery } from '../../../lib/api-client';
import { bandKeys } from './band-keys';

export async function getBandChanges(filter: Partial<BandChangesQuery>, signal?: AbortSignal): Promise<BandChange[]> {
  return (await api.get<{ changes: BandChange[] }>(withQuery('/api/bands/changes', filter), { signal })).changes;
}

export const bandChangesQueryOptions = (filter: Partial<BandChangesQuery> = {}) =>
  queryOptions({ queryKey: bandKeys.changes(filter), queryFn: ({ signal }) => getBandChanges(filter, signal) });

/** The change record (newest first); filter by tank or status. */
export function useBandChanges(filter: Partial<BandChangesQuery> = {}) {
  return useQuery(bandChangesQueryOptions(filter));
}
