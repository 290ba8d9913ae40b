import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';
import type { SimCommandInput } from '@shared/schemas/simulator';

/** 202: the simulator applies it within a moment, so the list is refreshed shortly after. */
export function setSimulatorFault(cmd: SimCommandInput): Promise<unknown> {
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
