import { createHmac, randomBytes } from 'node:crypto';
import jwt from 'jsonwebtoken';

/**
 * Signed acknowledge links for escalation mail. The key is derived from JWT_SECRET for this one
 * purpose and the audience differs from session tokens, so neither kind of token can stand in
 * for the other. Single use is enforced by alarm_ack_links.used_at, not by the token.
 */
const ALGORITHM = 'HS256' as const;
const AUDIENCE = 'ferrisight-alarm-ack';
const ISSUER = 'ferrisight';
/** Links stay valid this long by default: a night shift and some. */
export const ACK_LINK_TTL_S = 12 * 3600;

export type AckClaims = { jti: string; instanceId: number; email: string };
export type AckVerdict = { ok: true; claims: AckClaims } | { ok: false; reason: 'expired' | 'invalid' };

const keyOf = (secret: string) => createHmac('sha256', secret).update('ferrisight/alarm-ack-links/v1').digest();

export const newJti = (): string => randomBytes(16).toString('hex');

export function signAckToken(secret: string, c: AckClaims, nowMs: number, ttlS = ACK_LINK_TTL_S): string {
  const iat = Math.floor(nowMs / 1000);
  return jwt.sign({ iid: c.instanceId, em: c.email, iat, exp: iat + ttlS }, keyOf(secret), {
    algorithm: ALGORITHM, audience: AUDIENCE, issuer: ISSUER, jwtid: c.jti,
  });
}

/** Verifies against a one-algorithm allowlist; tampering and expiry are told apart for the page shown. */
export function verifyAckToken(secret: string, token: string, nowMs: number): AckVerdict {
  try {
    const p = jwt.verify(token, keyOf(secret), { algorithms: [ALGORITHM], audience: AUDIENCE, issuer: ISSUER, clockTimestamp: Math.floor(nowMs / 1000) });
    if (typeof p === 'string' || typeof p.jti !== 'string' || typeof p.iid !== 'number' || typeof p.em !== 'string') return { ok: false, reason: 'invalid' };
    return { ok: true, claims: { jti: p.jti, instanceId: p.iid, email: p.em } };
  } catch (err) {
    return { ok: false, reason: err instanceof jwt.TokenExpiredError ? 'expired' : 'invalid' };
  }
}
