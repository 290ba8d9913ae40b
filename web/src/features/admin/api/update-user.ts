import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { UpdateUserInput, UserRow } from '@shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { adminKeys } from './admin-keys';

export async function updateUser({ id, changes }: { id: number; changes: UpdateUserInput }): Promise<UserRow> {
  return (await api.patch<{ user: UserRow }>(`/api/users/${id}`, changes)).user;
}

export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: (user) => {
      qc.setQueryData<UserRow[]>(adminKeys.users(), (old) => old?.map((u) => (u.id === user.id ? { ...u, ...user } : u)));
      return qc.invalidateQueries({ queryKey: adminKeys.users() });
    },
  });
}
