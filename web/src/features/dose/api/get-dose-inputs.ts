import { queryOptions, useQuery } from '@tanstack/react-query';
import type { DoseInputs } from '@shared/schemas/dose';
import { api } from '../../../lib/api-client';
import { doseKeys } from './dose-keys';

export function getDoseInputs(tankId: number, signal?: AbortSignal): Promise<DoseInputs> {
  return api.get<DoseInputs>(`/api/dose/${tankId}`, { signal });
}

export const doseInputsQueryOptions = (tankId: number) =>
  queryOptions({ queryKey: doseKeys.inputs(tankId), queryFn: ({ signal }) => getDoseInputs(tankId, signal) });

/** The tank's present ratio, band, volume and latest total iron: the advisor's starting values. */
export function useDoseInputs(tankId: number) {
  return useQuery(doseInputsQueryOptions(tankId));
}
