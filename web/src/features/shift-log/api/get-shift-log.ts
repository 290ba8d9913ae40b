import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ShiftLogResponse } from '@shared/schemas/shifts';
import { api, withQuery } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

/** Others' entries have no live event of their own: the log refreshes every minute and on focus. */
const REFRESH_MS = 60_000;

export function getShiftLog(at: string | undefined, signal?: AbortSignal): Promise<ShiftLogResponse> {
  return api.get<ShiftLogResponse>(withQuery('/api/shift-log', { at }), { signal });
}

export const shiftLogQueryOptions = (at?: string) =>
  queryOptions({ queryKey: shiftLogKeys.log(at ?? 'current'), queryFn: ({ signal }) => getShiftLog(at, signal), staleTime: 15_000 });

/** The shift containing `at`, or (without it) the shift new entries go to, with its entries. */
export function useShiftLog(at?: string) {
  return useQuery({ ...shiftLogQueryOptions(at), enabled: at !== '', refetchInterval: at ? false : REFRESH_MS, refetchOnWindowFocus: true });
}
