import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShiftView } from '@shared/schemas/shifts';
import { api, withQuery } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

export type ShiftList = { timeZone: string; shifts: ShiftView[] };

export function getShifts(count: number, signal?: AbortSignal): Promise<ShiftList> {
  return api.get<ShiftList>(withQuery('/api/shifts', { count }), { signal });
}

export const shiftsQueryOptions = (count: number) =>
  queryOptions({ queryKey: digestKeys.shifts(count), queryFn: ({ signal }) => getShifts(count, signal), staleTime: 60_000 });

/** The current shift and the ones before it, newest first, for the shift picker. */
export function useShifts(count = 21) {
  return useQuery(shiftsQueryOptions(count));
}
