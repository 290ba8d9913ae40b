import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateUserInput, UserRow } from '@shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export async function createUser(input: CreateUserInput): Promise<UserRow> {
  return (await api.post<{ user: UserRow }>('/api/users', input)).user;
}

export function useCreateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    onSuccess: () => qc.invalidateQueries({ queryKey: adminKeys.users() }),
  });
}
