import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProbeCheckRow } from '@shared/schemas/probe-checks';
import { api, withQuery } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export async function getProbeChecks(probeId: number | undefined, signal?: AbortSignal): Promise<ProbeCheckRow[]> {
  return (await api.get<{ checks: ProbeCheckRow[] }>(withQuery('/api/probe-checks', { probeId, limit: 50 }), { signal })).checks;
}

export const probeChecksQueryOptions = (probeId?: number) =>
  queryOptions({ queryKey: calibrationKeys.probeChecks(probeId), queryFn: ({ signal }) => getProbeChecks(probeId, signal) });

export function useProbeChecks(probeId?: number) {
  return useQuery(probeChecksQueryOptions(probeId));
}
