import { queryOptions, useQuery } from '@tanstack/react-query';
import type { UserRow } from '@shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export async function getUsers(signal?: AbortSignal): Promise<UserRow[]> {
  return (await api.get<{ users: UserRow[] }>('/api/users', { signal })).users;
}

export const usersQueryOptions = () => queryOptions({ queryKey: adminKeys.users(), queryFn: ({ signal }) => getUsers(signal) });

export function useUsers() {
  return useQuery(usersQueryOptions());
}
