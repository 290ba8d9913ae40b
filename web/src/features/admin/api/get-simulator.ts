import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export const SIM_FAULTS = ['fouling', 'flatline', 'noisy', 'comms-loss', 'feed-upset', 'pump-trip'] as const;
export type SimFault = (typeof SIM_FAULTS)[number];
export type ActiveFault = { fault: SimFault; probeTag: string };

export async function getSimulator(signal?: AbortSignal): Promise<ActiveFault[]> {
  return (await api.get<{ faults: ActiveFault[] }>('/api/admin/simulator', { signal })).faults;
}

export const simulatorQueryOptions = () =>
  queryOptions({ queryKey: adminKeys.simulator(), queryFn: ({ signal }) => getSimulator(signal), refetchInterval: 5_000 });

export function useSimulator() {
  return useQuery(simulatorQueryOptions());
}
