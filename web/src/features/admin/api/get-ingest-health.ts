import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { BrokerHealth, IngestAlarmView, IngestHealth, PartState, WorkerBeatView } from '@shared/schemas/ingest-health';
import { adminKeys } from './admin-keys';

export type { BrokerHealth, IngestAlarmView, IngestHealth, PartState, WorkerBeatView };
/**
 * parts: null when no plant supervisor runs the API (a site's own service manager). workers: each
 * ingest worker's heartbeat; ingestAlarm: the plant-wide "ingest stopped" alarm.
 */
export type IngestHealthResponse = {
  health: IngestHealth | null; broker: BrokerHealth | null; parts: PartState[] | null; workers: WorkerBeatView[]; ingestAlarm: IngestAlarmView | null;
};

export function getIngestHealth(signal?: AbortSignal): Promise<IngestHealthResponse> {
  return api.get<IngestHealthResponse>('/api/admin/ingest-health', { signal });
}

export const ingestHealthQueryOptions = () =>
  queryOptions({ queryKey: adminKeys.ingestHealth(), queryFn: ({ signal }) => getIngestHealth(signal), refetchInterval: 5_000 });

export function useIngestHealth() {
  return useQuery(ingestHealthQueryOptions());
}
