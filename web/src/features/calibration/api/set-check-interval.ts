import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export function setCheckInterval({ probeId, intervalDays, reason }: { probeId: number; intervalDays: number; reason: string }): Promise<unknown> {
  return api.put<unknown>(`/api/probe-checks/schedule/${probeId}`, { intervalDays, reason });
}

export function useSetCheckInterval() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setCheckInterval, onSuccess: () => qc.invalidateQueries({ queryKey: calibrationKeys.schedule() }) });
}
