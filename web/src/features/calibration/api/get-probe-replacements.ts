import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProbeReplacementRow } from '@shared/schemas/probe-checks';
import { api, withQuery } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export async function getProbeReplacements(probeId: number | undefined, signal?: AbortSignal): Promise<ProbeReplacementRow[]> {
  return (await api.get<{ replacements: ProbeReplacementRow[] }>(withQuery('/api/probe-checks/replacements', { probeId, limit: 50 }), { signal })).replacements;
}

export const probeReplacementsQueryOptions = (probeId?: number) =>
  queryOptions({ queryKey: calibrationKeys.replacements(probeId), queryFn: ({ signal }) => getProbeReplacements(probeId, signal) });

export function useProbeReplacements(probeId?: number) {
  return useQuery(probeReplacementsQueryOptions(probeId));
}
