import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SessionUser, SignInInput } from '@shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { authKeys } from './auth-keys';

export async function signIn(input: SignInInput): Promise<SessionUser> {
  // 401 here means wrong credentials: the form says so, no redirect.
  return (await api.post<{ user: SessionUser }>('/api/auth/sign-in', input, { on401: 'throw' })).user;
}

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (user) => {
      // A different user may sign in on the same wall screen: nothing of the last session survives.
      qc.clear();
      qc.setQueryData(authKeys.me(), user);
    },
  });
}
