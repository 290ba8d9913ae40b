import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ProbeReplacementInput, ProbeReplacementRow } from '@shared/schemas/probe-checks';
import { api } from '../../../lib/api-client';
import { calibrationKeys } from './calibration-keys';

export async function recordProbeReplacement(input: ProbeReplacementInput): Promise<ProbeReplacementRow> {
  return (await api.post<{ replacement: ProbeReplacementRow }>('/api/probe-checks/replacements', input)).replacement;
}

/** A replacement makes the probe due for a check at once, so the schedule is refreshed too. */
export function useRecordProbeReplacement() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: recordProbeReplacement,
    onSuccess: () => Promise.all([
      qc.invalidateQueries({ queryKey: calibrationKeys.schedule() }),
      qc.invalidateQueries({ queryKey: calibrationKeys.replacementsAll() }),
    ]),
  });
}
