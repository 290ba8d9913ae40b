import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ImportJobView } from '@shared/schemas/import';
import { api } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

export function getImportJobs(signal?: AbortSignal): Promise<ImportJobView[]> {
  return api.get<{ jobs: ImportJobView[] }>('/api/readings/imports', { signal }).then((r) => r.jobs);
}

export const importJobsQueryOptions = () =>
  queryOptions({ queryKey: digestKeys.imports(), queryFn: ({ signal }) => getImportJobs(signal), staleTime: 10_000 });

export function useImportJobs(enabled: boolean) {
  return useQuery({ ...importJobsQueryOptions(), enabled });
}
