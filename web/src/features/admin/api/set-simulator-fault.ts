import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';
import type { SimFault } from './get-simulator';

export type SimCommand = { fault: SimFault; probeTag: string; action: 'start' | 'clear' };

/** 202: the simulator applies it within a moment, so the list is refreshed shortly after. */
export function setSimulatorFault(cmd: SimCommand): Promise<unknown> {
  return api.post<unknown>('/api/admin/simulator', cmd);
}

export function useSetSimulatorFault() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: setSimulatorFault,
    onSuccess: () => {
      setTimeout(() => void qc.invalidateQueries({ queryKey: adminKeys.simulator() }), 1_000);
    },
  });
}
