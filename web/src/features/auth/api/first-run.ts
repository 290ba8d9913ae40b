import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { SessionUser } from '@shared/schemas/auth';
import type { FirstRunInput } from '@shared/schemas/plant-setup';
import { api } from '../../../lib/api-client';
import { authKeys } from './auth-keys';
import { signIn } from './sign-in';

export const getFirstRunNeeded = (signal?: AbortSignal) => api.get<{ needed: boolean }>('/api/first-run', { signal, on401: 'throw' });

export function useFirstRunNeeded() {
  return useQuery({ queryKey: [...authKeys.all, 'first-run'], queryFn: ({ signal }) => getFirstRunNeeded(signal) });
}

/** Creates the first admin with the one-time token, then signs them in. */
export async function createFirstAdmin(input: FirstRunInput): Promise<SessionUser> {
  await api.post('/api/first-run', input, { on401: 'throw' });
  return signIn({ email: input.email, password: input.password });
}

export function useCreateFirstAdmin() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createFirstAdmin,
    onSuccess: (user) => {
      qc.clear();
      qc.setQueryData(authKeys.me(), user);
    },
  });
}
