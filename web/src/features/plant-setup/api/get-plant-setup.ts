import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PlantSetup } from '@shared/schemas/plant-setup';
import { api } from '../../../lib/api-client';
import { plantSetupKeys } from './plant-setup-keys';

export const getPlantSetup = (signal?: AbortSignal) => api.get<PlantSetup>('/api/plant-setup', { signal });

/** Refreshed every 15 s so gateway status (connected, last seen) stays current. */
export const plantSetupQueryOptions = () =>
  queryOptions({ queryKey: plantSetupKeys.parts(), queryFn: ({ signal }) => getPlantSetup(signal), refetchInterval: 15_000 });

export function usePlantSetup() {
  return useQuery(plantSetupQueryOptions());
}
