import type { Role, SessionUser } from '@shared/schemas/auth';
import { useMe } from '../api/get-me';

/** The signed-in user inside the app shell (the route loader made sure there is one). */
export function useSessionUser(): SessionUser | null {
  return useMe().data ?? null;
}

export function hasRole(user: SessionUser | null, roles: readonly Role[]): boolean {
  return !!user && roles.includes(user.role);
}
