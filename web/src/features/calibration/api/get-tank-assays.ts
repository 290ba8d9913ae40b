import { queryOptions, useQuery } from '@tanstack/react-query';
import type { AssaysResponse } from '@shared/schemas/assays';
import { api, withQuery } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export function getTankAssays(tankId: number, from: string, to: string, signal?: AbortSignal): Promise<AssaysResponse> {
  return api.get<AssaysResponse>(withQuery('/api/assays', { tankId, from, to, limit: 2000 }), { signal });
}

export const tankAssaysQueryOptions = (tankId: number, from: string, to: string) =>
  queryOptions({ queryKey: calibrationKeys.tankAssays(tankId, from, to), queryFn: ({ signal }) => getTankAssays(tankId, from, to, signal) });

/** The tank's live assays in the fit window, to choose from and exclude. */
export function useTankAssays(tankId: number, from: string, to: string) {
  return useQuery({ ...tankAssaysQueryOptions(tankId, from, to), enabled: Boolean(from && to) });
}
