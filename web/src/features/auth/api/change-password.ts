import { useMutation } from '@tanstack/react-query';
import type { ChangePasswordInput } from '@shared/schemas/auth';
import { api } from '../../../lib/api-client';

export function changePassword(input: ChangePasswordInput): Promise<void> {
  return api.post<void>('/api/auth/password', input);
}

/** On success the server ends every session of this user; the caller then ends it on screen too. */
export function useChangePassword() {
  return useMutation({ mutationFn: changePassword });
}
