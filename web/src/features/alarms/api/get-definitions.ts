import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DefinitionView } from '@shared/schemas/alarms';
import { api, withQuery } from '../../../lib/api-client';
import { alarmKeys } from './alarm-keys';

export const getDefinitions = (tankId: number, signal?: AbortSignal) =>
  api.get<{ definitions: DefinitionView[] }>(withQuery('/api/alarms/definitions', { tank: tankId }), { signal }).then((r) => r.definitions);

export const definitionsQueryOptions = (tankId: number) =>
  queryOptions({ queryKey: alarmKeys.definitions(tankId), queryFn: ({ signal }) => getDefinitions(tankId, signal), staleTime: 30_000 });

/** A tank's alarm definitions, with the limit in force now (band kinds read the tank's band). */
export function useDefinitions(tankId: number) {
  return useQuery(definitionsQueryOptions(tankId));
}
