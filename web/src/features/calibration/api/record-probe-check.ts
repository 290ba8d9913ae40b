import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProbeCheckInput, ProbeCheckRow } from '@shared/schemas/probe-checks';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export async function recordProbeCheck(input: ProbeCheckInput): Promise<ProbeCheckRow> {
  return (await api.post<{ check: ProbeCheckRow }>('/api/probe-checks', input)).check;
}

export function useRecordProbeCheck() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordProbeCheck,
    onSuccess: () => Promise.all([
      qc.invalidateQueries({ queryKey: calibrationKeys.schedule() }),
      qc.invalidateQueries({ queryKey: calibrationKeys.probeChecksAll() }),
    ]),
  });
}
