import { useMutation } from '@tanstack/react-query';
import type { CalibrationFitInput, FitResult } from '@shared/schemas/calibration';
import { api } from '../../../lib/api-client';

/** Fits E°′ (and k) from the chosen assays; writes nothing, so it can be rerun freely. */
export function fitCalibration({ tankId, input }: { tankId: number; input: CalibrationFitInput }): Promise<FitResult> {
  return api.post<FitResult>(`/api/calibration/${tankId}/fit`, input);
}

export function useFitCalibration() {
  return useMutation({ mutationFn: fitCalibration });
}
