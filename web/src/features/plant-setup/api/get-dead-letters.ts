import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { DeadLetterExportQuery, DeadLetterPage, DeadLetterQuery } from '@shared/schemas/dead-letters';
import { api, withQuery } from '../../../lib/api-client';
import { plantSetupKeys } from './plant-setup-keys';

export function getDeadLetters(q: Partial<DeadLetterQuery>, signal?: AbortSignal): Promise<DeadLetterPage> {
  return api.get<DeadLetterPage>(withQuery('/api/dead-letters', q), { signal });
}

/** Same filters as the screen, every matching dead letter (or conflict) as a CSV download (the browser sends the sign-in cookie). */
export const deadLettersCsvUrl = (q: Partial<DeadLetterQuery>, table: DeadLetterExportQuery['table']) =>
  withQuery('/api/dead-letters/export', { ...q, limit: undefined, table });

export const deadLettersQueryOptions = (q: Partial<DeadLetterQuery>) =>
  queryOptions({ queryKey: plantSetupKeys.deadLetters(q), queryFn: ({ signal }) => getDeadLetters(q, signal), placeholderData: keepPreviousData });

export function useDeadLetters(q: Partial<DeadLetterQuery>) {
  return useQuery(deadLettersQueryOptions(q));
}
