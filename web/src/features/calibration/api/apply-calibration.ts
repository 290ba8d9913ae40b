import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ApplyResult, CalibrationApplyInput } from '@shared/schemas/calibration';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

/** Stores a new calibration version; the ingest worker converts with it from then on. */
export function applyCalibration({ tankId, input }: { tankId: number; input: CalibrationApplyInput }): Promise<ApplyResult> {
  return api.post<ApplyResult>(`/api/calibration/${tankId}/apply`, input);
}

export function useApplyCalibration(onApplied?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: applyCalibration,
    onSuccess: (_r, { tankId }) => {
      onApplied?.();
      return qc.invalidateQueries({ queryKey: calibrationKeys.overview(tankId) });
    },
  });
}
