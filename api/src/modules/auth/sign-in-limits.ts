import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { ipKeyGenerator, rateLimit, type AugmentedRequest, type Options } from 'express-rate-limit';
import { slowDown } from 'express-slow-down';
import { AppError } from '../../lib/app-error.ts';
import { MariadbRateLimitStore } from './rate-limit.repository.ts';

/**
 * Limits on POST /api/auth/sign-in (OWASP ASVS 5.0 6.1.1, 6.3.1 anti-automation), counted in
 * MariaDB so every API node sees the same numbers. Only failed attempts count.
 * - account + address: a guesser is stopped on that account from that address;
 * - address: one address spraying many accounts is stopped;
 * - account, all addresses: each attempt beyond `accountSlowAfter` waits a little longer
 *   (never refused), except from an address that has signed in to that account before, so a
 *   stranger who knows an e-mail address cannot keep its owner out.
 */
export type SignInLimitSettings = {
  windowMs: number;
  perAccountAddress: number;
  perAddress: number;
  accountSlowAfter: number;
  /** Added per failed attempt beyond accountSlowAfter, up to maxDelayMs. */
  delayStepMs: number;
  maxDelayMs: number;
  /** How long an address counts as the account's own after a successful sign-in. */
  knownAddressMs: number;
};

export const SIGN_IN_LIMITS: SignInLimitSettings = {
  windowMs: 15 * 60_000,
  perAccountAddress: 5,
  perAddress: 30,
  accountSlowAfter: 10,
  delayStepMs: 500,
  maxDelayMs: 10_000,
  knownAddressMs: 30 * 86_400_000,
};

const account = (req: Request) => {
  const email = (req.body as { email?: unknown } | undefined)?.email;
  return typeof email === 'string' ? email.trim().toLowerCase() : '';
};
// IPv6 clients are counted per /56, as express-rate-limit recommends: one host owns many addresses.
const address = (req: Request) => ipKeyGenerator(req.ip ?? 'unknown');

const refuse: Options['handler'] = (req, res, next) => {
  const reset = (req as AugmentedRequest).rateLimit?.resetTime;
  const resetMs = reset ? reset.getTime() - Date.now() : 60_000;
  const wait = Math.max(1, Math.ceil(resetMs / 1000));
  res.set('Retry-After', String(wait));
  next(new AppError(429, 'too-many-attempts', `Too many failed sign-ins from this address; try again in ${Math.ceil(wait / 60)} min`, { retryAfterS: wait }));
};

export function signInLimits(s: SignInLimitSettings = SIGN_IN_LIMITS): RequestHandler[] {
  const known = new MariadbRateLimitStore('known:');
  known.windowMs = s.knownAddressMs;
  const pairKey = (req: Request) => `${account(req)}|${address(req)}`;
  const common = { windowMs: s.windowMs, skipSuccessfulRequests: true, standardHeaders: false, legacyHeaders: false } as const;

  const byAddress = rateLimit({ ...common, limit: s.perAddress, store: new MariadbRateLimitStore('ip:'), keyGenerator: address, handler: refuse });
  const byAccountAddress = rateLimit({ ...common, limit: s.perAccountAddress, store: new MariadbRateLimitStore('pair:'), keyGenerator: pairKey, handler: refuse });
  const byAccount = slowDown({
    ...common,
    store: new MariadbRateLimitStore('acct:'),
    keyGenerator: account,
    delayAfter: s.accountSlowAfter,
    delayMs: (used) => (used - s.accountSlowAfter) * s.delayStepMs,
    maxDelayMs: s.maxDelayMs,
    skip: async (req) => ((await known.get(pairKey(req)))?.totalHits ?? 0) > 0,
  });
  const remember = (req: Request, res: Response, next: NextFunction) => {
    res.on('finish', () => {
      if (res.statusCode === 200) void known.increment(pairKey(req)).catch(() => {});
    });
    next();
  };
  return [byAddress, byAccountAddress, byAccount, remember];
}
