import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export function signOut(): Promise<void> {
  return api.post<void>('/api/auth/sign-out', undefined, { on401: 'throw' });
}

/** Signs out. The caller ends the session on screen (navigate first, then drop the cache), whatever the server said. */
export function useSignOut() {
  return useMutation({ mutationFn: signOut });
}
