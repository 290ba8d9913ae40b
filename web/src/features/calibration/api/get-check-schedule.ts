import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ProbeDue } from '@shared/schemas/probe-checks';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export async function getCheckSchedule(signal?: AbortSignal): Promise<ProbeDue[]> {
  return (await api.get<{ probes: ProbeDue[] }>('/api/probe-checks/schedule', { signal })).probes;
}

export const checkScheduleQueryOptions = () =>
  queryOptions({ queryKey: calibrationKeys.schedule(), queryFn: ({ signal }) => getCheckSchedule(signal), refetchInterval: 60_000 });

/** Every active probe with its check interval, last check and due date. */
export function useCheckSchedule() {
  return useQuery(checkScheduleQueryOptions());
}
