import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { simStateSchema, type ActiveFault } from '@shared/schemas/simulator';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

const simulatorResponseSchema = z.object({ faults: simStateSchema.shape.faults });

export async function getSimulator(signal?: AbortSignal): Promise<ActiveFault[]> {
  return simulatorResponseSchema.parse(await api.get<unknown>('/api/admin/simulator', { signal })).faults;
}

export const simulatorQueryOptions = () =>
  queryOptions({ queryKey: adminKeys.simulator(), queryFn: ({ signal }) => getSimulator(signal), refetchInterval: 5_000 });

export function useSimulator() {
  return useQuery(simulatorQueryOptions());
}
