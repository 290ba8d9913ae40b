import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionUser } from '@shared/schemas/auth';
import { api, ApiError } from '../../../lib/api-client';
import { authKeys } from './auth-keys';

/** The signed-in user, or null when there is no session (never redirects by itself). */
export async function getMe(): Promise<SessionUser | null> {
  try {
    return (await api.get<{ user: SessionUser }>('/api/auth/me', { on401: 'throw' })).user;
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

export const meQueryOptions = () => queryOptions({ queryKey: authKeys.me(), queryFn: getMe, staleTime: 5 * 60_000 });

export function useMe() {
  return useQuery(meQueryOptions());
}
