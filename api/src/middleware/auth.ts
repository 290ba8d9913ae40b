import type { RequestHandler } from 'express';
import type { Role } from '../../../shared/schemas/auth.ts';
import { AppError } from '../lib/app-error.ts';
import { logger } from '../lib/logger.ts';
import type { AuthService } from '../modules/auth/auth.service.ts';
import { CSRF_HEADER, SESSION_COOKIE } from '../modules/auth/tokens.ts';

/** Reads the session cookie (or a Bearer token, for scripts) and attaches the live user. */
export function sessionMiddleware(auth: AuthService): RequestHandler {
  return async (req, _res, next) => {
    const header = req.get('authorization');
    const bearer = header?.startsWith('Bearer ') ? header.slice(7) : undefined;
    const user = await auth.authenticate(bearer ?? req.cookies?.[SESSION_COOKIE]);
    if (user) req.user = user;
    next();
  };
}

/**
 * The session rides in a SameSite=Strict cookie; state-changing requests must also carry a
 * custom header, which a cross-site form cannot send and a cross-site fetch cannot without CORS.
 */
export const csrfGuard: RequestHandler = (req, _res, next) => {
  if (['GET', 'HEAD', 'OPTIONS'].includes(req.method)) return next();
  if (req.get(CSRF_HEADER) !== '1') return next(new AppError(403, 'csrf', `Missing ${CSRF_HEADER} header`));
  next();
};

/** 401 without a session, 403 (logged) when the role is not in the list. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    if (!req.user) return next(AppError.unauthorized());
    if (roles.length > 0 && !roles.includes(req.user.role)) {
      logger.warn({ userId: req.user.id, role: req.user.role, method: req.method, path: req.originalUrl }, 'access denied');
      return next(AppError.forbidden());
    }
    next();
  };
}

export const requireSignIn = requireRole();
