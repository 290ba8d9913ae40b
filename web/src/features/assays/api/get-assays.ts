import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AssaysResponse } from '@shared/schemas/assays';
import { api, withQuery } from '../../../lib/api-client';
import { assayKeys, type AssayFilter } from './assay-keys';

export function getAssays(filter: AssayFilter, signal?: AbortSignal): Promise<AssaysResponse> {
  return api.get<AssaysResponse>(withQuery('/api/assays', filter), { signal });
}

export const assaysQueryOptions = (filter: AssayFilter = {}) =>
  queryOptions({ queryKey: assayKeys.list(filter), queryFn: ({ signal }) => getAssays(filter, signal) });

/** Stored assays, newest first, each matched to the probe readings around its sampling time. */
export function useAssays(filter: AssayFilter = {}) {
  return useQuery(assaysQueryOptions(filter));
}
