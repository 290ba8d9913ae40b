import { useMutation } from '@tanstack/react-query';
import type { RecomputeInput, RecomputeResult } from '@shared/schemas/calibration';
import { api } from '../../../lib/api-client';

/** Rewrites a period of stored readings with a chosen version; recorded in the audit log. */
export function recomputeReadings({ tankId, input }: { tankId: number; input: RecomputeInput }): Promise<RecomputeResult> {
  return api.post<RecomputeResult>(`/api/calibration/${tankId}/recompute`, input);
}

export function useRecomputeReadings() {
  return useMutation({ mutationFn: recomputeReadings });
}
