import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export type IngestHealth = {
  messages: number;
  readings: number;
  deadLetters: number;
  conflicts: number;
  duplicates: number;
  lagMs: number | null;
  batchP50Ms: number | null;
  batchP99Ms: number | null;
  updatedAt: string | null;
};

export function getIngestHealth(signal?: AbortSignal): Promise<IngestHealth> {
  return api.get<IngestHealth>('/api/admin/ingest-health', { signal });
}

export const ingestHealthQueryOptions = () =>
  queryOptions({ queryKey: adminKeys.ingestHealth(), queryFn: ({ signal }) => getIngestHealth(signal), refetchInterval: 5_000 });

export function useIngestHealth() {
  return useQuery(ingestHealthQueryOptions());
}
