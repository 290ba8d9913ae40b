import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ShiftView } from '@shared/schemas/roster';
import { api, withQuery } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const getShifts = (from: string, to: string, signal?: AbortSignal) =>
  api.get<{ shifts: ShiftView[] }>(withQuery('/api/roster/shifts', { from, to }), { signal }).then((r) => r.shifts);

export const shiftsQueryOptions = (from: string, to: string) =>
  queryOptions({ queryKey: rosterKeys.shifts(from, to), queryFn: ({ signal }) => getShifts(from, to, signal), placeholderData: keepPreviousData });

export function useShifts(from: string, to: string) {
  return useQuery(shiftsQueryOptions(from, to));
}
