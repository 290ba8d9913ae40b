import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ImportJobView } from '@shared/schemas/import';
import { api } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

const POLL_MS = 1_000;

export function getImportJob(id: number, signal?: AbortSignal): Promise<ImportJobView> {
  return api.get<{ job: ImportJobView }>(`/api/readings/imports/${id}`, { signal }).then((r) => r.job);
}

export const importJobQueryOptions = (id: number) =>
  queryOptions({ queryKey: digestKeys.importJob(id), queryFn: ({ signal }) => getImportJob(id, signal) });

/** Rejected rows of a finished job, as a CSV download link. */
export const rejectionsUrl = (id: number) => `/api/readings/imports/${id}/rejections`;

/**
 * One import job, polled every second while it runs: an import is a job of this one user,
 * not plant data, so it has no socket event of its own. Polling stops when it ends.
 */
export function useImportJob(id: number | null) {
  return useQuery({
    ...importJobQueryOptions(id ?? 0),
    enabled: id !== null,
    refetchInterval: (q) => (q.state.data && (q.state.data.status === 'done' || q.state.data.status === 'failed') ? false : POLL_MS),
  });
}
