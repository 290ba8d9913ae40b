import { queryOptions, useQuery } from '@tanstack/react-query';
import type { OnCallNow } from '@shared/schemas/roster';
import { api } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const getOnCall = (signal?: AbortSignal) => api.get<OnCallNow>('/api/roster/now', { signal });

// Shifts change on the hour at most: a minute's refresh keeps "now" right without a push.
export const onCallQueryOptions = () => queryOptions({ queryKey: rosterKeys.now(), queryFn: ({ signal }) => getOnCall(signal), refetchInterval: 60_000 });

export function useOnCall() {
  return useQuery(onCallQueryOptions());
}
