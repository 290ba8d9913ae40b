import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { EscalationStepView, PolicyInput } from '@shared/schemas/roster';
import { api } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

/** Replaces one priority's steps at once; the reason goes to the change record. */
export const setPolicy = (input: PolicyInput) => api.put<{ steps: EscalationStepView[] }>('/api/roster/policy', input).then((r) => r.steps);

export function useSetPolicy() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: setPolicy, onSuccess: () => qc.invalidateQueries({ queryKey: rosterKeys.policy() }) });
}
