import jwt from 'jsonwebtoken';
import type { Role } from '../../../../shared/schemas/auth.ts';

const ALGORITHM = 'HS256' as const;
const AUDIENCE = 'ferrisight';
const ISSUER = 'ferrisight';

export type TokenClaims = { sub: string; role: Role; iatMs: number; exp: number };

/** Issues a session token; `iatMs` lets sign-out invalidate tokens issued in the same second. */
export function issueToken(user: { id: number; role: Role }, secret: string, ttlS: number, nowMs = Date.now()): string {
  return jwt.sign({ role: user.role, iatMs: nowMs }, secret, {
    algorithm: ALGORITHM, expiresIn: ttlS, audience: AUDIENCE, issuer: ISSUER, subject: String(user.id),
  });
}

/** Verifies against a one-algorithm allowlist (never `none`); null when invalid or expired. */
export function verifyToken(token: string, secret: string): TokenClaims | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: [ALGORITHM], audience: AUDIENCE, issuer: ISSUER });
    if (typeof claims === 'string' || typeof claims.sub !== 'string' || typeof claims.iatMs !== 'number' || typeof claims.exp !== 'number') return null;
    return { sub: claims.sub, role: claims.role as Role, iatMs: claims.iatMs, exp: claims.exp };
  } catch {
    return null;
  }
}

export const SESSION_COOKIE = 'fs_session';
export const CSRF_HEADER = 'x-ferrisight-csrf';
