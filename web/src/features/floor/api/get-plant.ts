import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PlantResponse } from '@shared/schemas/plant';
import { api } from '../../../lib/api-client';
import { setServerTime } from '../../../lib/clock';
import { FALLBACK_POLL_MS, useIsLive } from '../../../lib/socket';
import { plantKeys } from './plant-keys';

export async function getPlant(): Promise<PlantResponse> {
  const plant = await api.get<PlantResponse>('/api/plant');
  setServerTime(plant.serverTime);
  return plant;
}

export const plantQueryOptions = () => queryOptions({ queryKey: plantKeys.tree(), queryFn: getPlant, staleTime: 30_000 });

/** The plant tree; pushed live over the socket, polled every 10 s only while the socket is down. */
export function usePlant() {
  const live = useIsLive();
  return useQuery({ ...plantQueryOptions(), refetchInterval: live ? false : FALLBACK_POLL_MS });
}
