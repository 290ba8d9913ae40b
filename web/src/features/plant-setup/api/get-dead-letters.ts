import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { DeadLetterPage, DeadLetterQuery } from '@shared/schemas/dead-letters';
import { api } from '../../../lib/api-client';
import { plantSetupKeys } from './plant-setup-keys';

export function getDeadLetters(q: Partial<DeadLetterQuery>, signal?: AbortSignal): Promise<DeadLetterPage> {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(q)) if (v !== undefined && v !== '') params.set(k, String(v));
  return api.get<DeadLetterPage>(`/api/dead-letters?${params.toString()}`, { signal });
}

export const deadLettersQueryOptions = (q: Partial<DeadLetterQuery>) =>
  queryOptions({ queryKey: plantSetupKeys.deadLetters(q), queryFn: ({ signal }) => getDeadLetters(q, signal), placeholderData: keepPreviousData });

export function useDeadLetters(q: Partial<DeadLetterQuery>) {
  return useQuery(deadLettersQueryOptions(q));
}
