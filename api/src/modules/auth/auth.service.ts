import bcrypt from 'bcryptjs';
import type { ChangePasswordInput, SessionUser, SignInInput } from '../../../../shared/schemas/auth.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import { usersRepository } from '../users/users.repository.ts';
import { issueToken, verifyToken } from './tokens.ts';

/** bcrypt cost 12: ≈ 200 ms here, inside ASVS's 50–250 ms target for cost ≥ 10. */
export const BCRYPT_COST = 12;
// Compared against when the e-mail is unknown, so timing does not reveal which accounts exist.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST);

export type AuthSettings = { jwtSecret: string; ttlS: number };

/** Sign-in limits are middleware in front of the route (sign-in-limits.ts), counted across nodes. */
export function createAuthService(settings: AuthSettings) {
  return {
    async signIn(input: SignInInput, ip: string): Promise<{ user: SessionUser; token: string }> {
      const row = await usersRepository.findByEmailWithHash(input.email);
      const ok = await bcrypt.compare(input.password, row?.passwordHash ?? DUMMY_HASH);
      if (!row || !ok || row.disabled) {
        logger.warn({ email: input.email, ip, disabled: row?.disabled ?? false }, 'sign-in refused');
        throw AppError.unauthorized(row?.disabled && ok ? 'This account is disabled' : 'E-mail or password is wrong');
      }
      const user: SessionUser = { id: row.id, email: row.email, name: row.name, role: row.role };
      return { user, token: issueToken(user, settings.jwtSecret, settings.ttlS) };
    },

    /** Resolves a token to a live user: refuses disabled users and tokens older than the last sign-out. */
    async authenticate(token: string | undefined): Promise<(SessionUser & { expMs: number }) | null> {
      if (!token) return null;
      const claims = verifyToken(token, settings.jwtSecret);
      if (!claims) return null;
      const row = await usersRepository.findSessionState(Number(claims.sub));
      if (!row || row.disabled || claims.iatMs <= row.tokensValidAfter.getTime()) return null;
      return { id: row.id, email: row.email, name: row.name, role: row.role, expMs: claims.exp * 1000 };
    },

    async signOut(userId: number): Promise<void> {
      await usersRepository.revokeTokens(userId);
    },

    async changePassword(userId: number, input: ChangePasswordInput): Promise<void> {
      const row = await usersRepository.findByIdWithHash(userId);
      if (!row || !(await bcrypt.compare(input.currentPassword, row.passwordHash))) {
        throw AppError.badRequest('Current password is wrong', { errors: [{ path: 'currentPassword', message: 'Current password is wrong' }] });
      }
      await usersRepository.setPassword(userId, await bcrypt.hash(input.newPassword, BCRYPT_COST), userId);
    },
  };
}

export type AuthService = ReturnType<typeof createAuthService>;
