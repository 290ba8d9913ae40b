import { Router } from 'express';
import { changePasswordSchema, signInSchema } from '../../../../shared/schemas/auth.ts';
import { requireSignIn } from '../../middleware/auth.ts';
import { body } from '../../middleware/validate.ts';
import type { AuthService } from './auth.service.ts';
import { signInLimits, type SignInLimitSettings } from './sign-in-limits.ts';
import { SESSION_COOKIE } from './tokens.ts';

export function authRouter(auth: AuthService, opts: { secureCookie: boolean; ttlS: number; limits?: SignInLimitSettings }): Router {
  const r = Router();
  const cookieOptions = { httpOnly: true, sameSite: 'strict' as const, secure: opts.secureCookie, path: '/' };

  r.post('/sign-in', ...signInLimits(opts.limits), async (req, res) => {
    const input = body(signInSchema, req);
    const { user, token } = await auth.signIn(input, req.ip ?? 'unknown');
    res.cookie(SESSION_COOKIE, token, { ...cookieOptions, maxAge: opts.ttlS * 1000 });
    res.json({ user });
  });

  r.post('/sign-out', requireSignIn, async (req, res) => {
    await auth.signOut(req.user!.id);
    res.clearCookie(SESSION_COOKIE, cookieOptions);
    res.status(204).end();
  });

  r.get('/me', requireSignIn, (req, res) => {
    const { expMs: _exp, ...user } = req.user!;
    res.json({ user });
  });

  r.post('/password', requireSignIn, async (req, res) => {
    await auth.changePassword(req.user!.id, body(changePasswordSchema, req));
    res.clearCookie(SESSION_COOKIE, cookieOptions);
    res.status(204).end();
  });

  return r;
}
