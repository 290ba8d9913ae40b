import { queryOptions, useQuery } from '@tanstack/react-query';
import type { EscalationStepView } from '@shared/schemas/roster';
import { api } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const getPolicy = (signal?: AbortSignal) => api.get<{ steps: EscalationStepView[] }>('/api/roster/policy', { signal }).then((r) => r.steps);

export const policyQueryOptions = () => queryOptions({ queryKey: rosterKeys.policy(), queryFn: ({ signal }) => getPolicy(signal) });

export function usePolicy() {
  return useQuery(policyQueryOptions());
}
