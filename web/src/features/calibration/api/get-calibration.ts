import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CalibrationOverview } from '@shared/schemas/calibration';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export function getCalibration(tankId: number, signal?: AbortSignal): Promise<CalibrationOverview> {
  return api.get<CalibrationOverview>(`/api/calibration/${tankId}`, { signal });
}

export const calibrationQueryOptions = (tankId: number) =>
  queryOptions({ queryKey: calibrationKeys.overview(tankId), queryFn: ({ signal }) => getCalibration(tankId, signal) });

/** The tank's probe, the calibration in force and every earlier version. */
export function useCalibration(tankId: number) {
  return useQuery(calibrationQueryOptions(tankId));
}
