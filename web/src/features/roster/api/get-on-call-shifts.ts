import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { OnCallShiftView } from '@shared/schemas/roster';
import { api, withQuery } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const getOnCallShifts = (from: string, to: string, signal?: AbortSignal) =>
  api.get<{ shifts: OnCallShiftView[] }>(withQuery('/api/roster/shifts', { from, to }), { signal }).then((r) => r.shifts);

export const onCallShiftsQueryOptions = (from: string, to: string) =>
  queryOptions({ queryKey: rosterKeys.shifts(from, to), queryFn: ({ signal }) => getOnCallShifts(from, to, signal), placeholderData: keepPreviousData });

export function useOnCallShifts(from: string, to: string) {
  return useQuery(onCallShiftsQueryOptions(from, to));
}
