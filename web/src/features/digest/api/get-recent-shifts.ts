import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShiftView } from '@shared/schemas/shifts';
import { api, withQuery } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

export type RecentShifts = { timeZone: string; shifts: ShiftView[] };

export function getRecentShifts(count: number, signal?: AbortSignal): Promise<RecentShifts> {
  return api.get<RecentShifts>(withQuery('/api/shifts', { count }), { signal });
}

export const recentShiftsQueryOptions = (count: number) =>
  queryOptions({ queryKey: digestKeys.shifts(count), queryFn: ({ signal }) => getRecentShifts(count, signal), staleTime: 60_000 });

/** The current shift and the ones before it, newest first, for the shift picker. */
export function useRecentShifts(count = 21) {
  return useQuery(recentShiftsQueryOptions(count));
}
