import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { IngestHealth } from '@shared/schemas/ingest-health';
import { adminKeys } from './admin-keys';

export type { IngestHealth };

export function getIngestHealth(signal?: AbortSignal): Promise<{ health: IngestHealth | null }> {
  return api.get<{ health: IngestHealth | null }>('/api/admin/ingest-health', { signal });
}

export const ingestHealthQueryOptions = () =>
  queryOptions({ queryKey: adminKeys.ingestHealth(), queryFn: ({ signal }) => getIngestHealth(signal), refetchInterval: 5_000 });

export function useIngestHealth() {
  return useQuery(ingestHealthQueryOptions());
}
