import jwt from 'jsonwebtoken';
import request from 'supertest';
import type { Express } from 'express';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { User } from '../../api/src/db/models.ts';
import { BCRYPT_COST, createAuthService } from '../../api/src/modules/auth/auth.service.ts';
import { SIGN_IN_LIMITS } from '../../api/src/modules/auth/sign-in-limits.ts';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import { createTestApi, signIn, TEST_PASSWORD, TEST_SECRET, type TestApi } from '../helpers/api.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi({ seedPlant: false });
});
afterAll(async () => t?.close());

const post = (path: string) => request(t.app).post(path).set('X-Ferrisight-Csrf', '1');
const me = (cookieOrBearer: string) =>
  cookieOrBearer.startsWith('Bearer ')
    ? request(t.app).get('/api/auth/me').set('Authorization', cookieOrBearer)
    : request(t.app).get('/api/auth/me').set('Cookie', cookieOrBearer);

describe('sign-in', () => {
  it('when the password is right, then an httpOnly SameSite=Strict cookie is set and /me answers', async () => {
    const res = await post('/api/auth/sign-in').send({ email: 't-operator@test.example', password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: 't-operator@test.example', role: 'operator' });
    const cookie = String(res.headers['set-cookie']);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
    expect((await me(cookie.split(';')[0])).body.user.role).toBe('operator');
  });

  it('when the password is wrong, then 401 with a JSON problem and no cookie', async () => {
    const res = await post('/api/auth/sign-in').send({ email: 't-operator@test.example', password: 'nope-nope' });
    expect(res.status).toBe(401);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.headers['set-cookie']).toBeUndefined();
  });

  it('when the e-mail is malformed or fields are missing, then 400 names the fields', async () => {
    const res = await post('/api/auth/sign-in').send({ email: 'not-an-email' });
    expect(res.status).toBe(400);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['email', 'password']);
  });

  it('when the body is not JSON, then 400, not 500', async () => {
    const res = await post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{"email":');
    expect(res.status).toBe(400);
  });

  it('when the CSRF header is missing on a POST, then 403', async () => {
    const res = await request(t.app).post('/api/auth/sign-in').send({ email: 't-operator@test.example', password: TEST_PASSWORD });
    expect(res.status).toBe(403);
  });
});

describe('sign-in limits (OWASP ASVS 5.0 6.1.1, 6.3.1: anti-automation without a lock-out by strangers)', () => {
  const limits = { ...SIGN_IN_LIMITS, perAccountAddress: 5, perAddress: 30, accountSlowAfter: 10, delayStepMs: 50, maxDelayMs: 1000 };
  const node = (trustProxy?: string[]) => createApp({ auth: createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 }), ttlS: 3600, trustProxy, signInLimits: limits });
  const attempt = (app: Express, email: string, password: string, from?: string) => {
    const r = request(app).post('/api/auth/sign-in').set('X-Ferrisight-Csrf', '1');
    return (from ? r.set('X-Forwarded-For', from) : r).send({ email, password });
  };
  const timed = async (p: PromiseLike<request.Response>) => {
    const t0 = performance.now();
    const res = await p;
    return { res, ms: performance.now() - t0 };
  };

  it('when X-Forwarded-For rotates from a peer that is not a trusted proxy, then every attempt counts for the one real address and the 6th gets 429 with Retry-After', async () => {
    const app = node();
    for (let i = 0; i < 5; i++) expect((await attempt(app, 't-supervisor@test.example', 'wrong-password', `198.51.100.${i + 1}`)).status).toBe(401);
    const blocked = await attempt(app, 't-supervisor@test.example', 'wrong-password', '198.51.100.99');
    expect(blocked.status).toBe(429);
    expect(blocked.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('when one address tries many accounts, then it is refused after the per-address limit, also for accounts it has not tried yet', async () => {
    const app = createApp({ auth: createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 }), ttlS: 3600, trustProxy: ['loopback'], signInLimits: { ...limits, perAddress: 12 } });
    const roles = ['operator', 'supervisor', 'metallurgist', 'engineer', 'admin'];
    const statuses: number[] = [];
    for (let i = 0; i < 13; i++) statuses.push((await attempt(app, `t-${roles[i % roles.length]}@test.example`, 'wrong-password', '198.51.100.150')).status);
    expect(statuses).toEqual([...Array(12).fill(401), 429]);
    expect((await attempt(app, 't-engineer@test.example', TEST_PASSWORD, '198.51.100.150')).status).toBe(429);
  });

  it('when the proxy is trusted, then each forwarded client is counted on its own', async () => {
    const app = node(['loopback']);
    for (let i = 0; i < 7; i++) expect((await attempt(app, 't-engineer@test.example', 'wrong-password', `192.0.2.${i + 1}`)).status).toBe(401);
    expect((await attempt(app, 't-engineer@test.example', TEST_PASSWORD, '192.0.2.200')).status).toBe(200);
  });

  it('when 50 attempts fail for an account from another address, then its user signs in at once from their own address', async () => {
    const app = node(['loopback']);
    const own = '203.0.113.77';
    expect((await attempt(app, 't-metallurgist@test.example', TEST_PASSWORD, own)).status).toBe(200);
    const statuses: number[] = [];
    for (let i = 0; i < 50; i++) statuses.push((await attempt(app, 't-metallurgist@test.example', 'wrong-password', '198.51.100.66')).status);
    expect(statuses.filter((s) => s === 401)).toHaveLength(5);
    expect(statuses.filter((s) => s === 429)).toHaveLength(45);
    const { res, ms } = await timed(attempt(app, 't-metallurgist@test.example', TEST_PASSWORD, own));
    expect(res.status).toBe(200);
    expect(ms).toBeLessThan(limits.delayStepMs * 5);
  });

  it('when 50 attempts fail for an account from 50 addresses, then attempts from other addresses are slowed, not refused, and its user signs in at once from their own address', async () => {
    const app = node(['loopback']);
    const own = '203.0.113.78';
    await vi.waitFor(async () => expect((await attempt(app, 't-admin@test.example', TEST_PASSWORD, own)).status).toBe(200));
    // The success above marks the address as the account's own; give the write its moment.
    await new Promise((r) => setTimeout(r, 200));
    for (let batch = 0; batch < 5; batch++) {
      const rs = await Promise.all(Array.from({ length: 10 }, (_, i) => attempt(app, 't-admin@test.example', 'wrong-password', `100.64.${batch}.${i + 1}`)));
      for (const r of rs) expect(r.status).toBe(401);
    }
    const stranger = await timed(attempt(app, 't-admin@test.example', TEST_PASSWORD, '100.64.9.9'));
    expect(stranger.res.status).toBe(200);
    expect(stranger.ms).toBeGreaterThanOrEqual(limits.maxDelayMs * 0.9);
    const owner = await timed(attempt(app, 't-admin@test.example', TEST_PASSWORD, own));
    expect(owner.res.status).toBe(200);
    expect(owner.ms).toBeLessThan(limits.delayStepMs * 5);
  });

  it('when attempts alternate between two API nodes, then the limit is shared: the 6th is refused', async () => {
    const [a, b] = [node(['loopback']), node(['loopback'])];
    const statuses: number[] = [];
    for (let i = 0; i < 6; i++) statuses.push((await attempt(i % 2 ? b : a, 't-operator@test.example', 'wrong-password', '198.51.100.201')).status);
    expect(statuses).toEqual([401, 401, 401, 401, 401, 429]);
    expect((await attempt(a, 't-operator@test.example', TEST_PASSWORD, '198.51.100.202')).status).toBe(200);
  });
});

describe('tokens (ASVS 5.0 §9, §7.4)', () => {
  const id = () => t.users.engineer;
  it('when the signature is forged, then 401', async () => {
    const forged = issueToken({ id: id(), role: 'admin' }, 'another-secret-another-secret-another-secret', 3600);
    expect((await me(`Bearer ${forged}`)).status).toBe(401);
  });
  it('when alg is none, then 401', async () => {
    const none = jwt.sign({ role: 'admin', iatMs: Date.now() }, '', { algorithm: 'none', subject: String(id()), audience: 'ferrisight', issuer: 'ferrisight', expiresIn: 3600 });
    expect((await me(`Bearer ${none}`)).status).toBe(401);
  });
  it('when a different HMAC algorithm is used, then 401', async () => {
    const hs512 = jwt.sign({ role: 'admin', iatMs: Date.now() }, TEST_SECRET, { algorithm: 'HS512', subject: String(id()), audience: 'ferrisight', issuer: 'ferrisight', expiresIn: 3600 });
    expect((await me(`Bearer ${hs512}`)).status).toBe(401);
  });
  it('when the token has expired, then 401', async () => {
    const old = jwt.sign({ role: 'engineer', iatMs: Date.now() - 7200_000, exp: Math.floor(Date.now() / 1000) - 60 }, TEST_SECRET, { algorithm: 'HS256', subject: String(id()), audience: 'ferrisight', issuer: 'ferrisight' });
    expect((await me(`Bearer ${old}`)).status).toBe(401);
  });
  it('when the token is not yet valid, then 401', async () => {
    const early = jwt.sign({ role: 'engineer', iatMs: Date.now() }, TEST_SECRET, { algorithm: 'HS256', subject: String(id()), audience: 'ferrisight', issuer: 'ferrisight', expiresIn: 3600, notBefore: 600 });
    expect((await me(`Bearer ${early}`)).status).toBe(401);
  });
  it('when the user signs out, then the old cookie stops working', async () => {
    const cookie = await signIn(t.app, 't-engineer@test.example', TEST_PASSWORD);
    expect((await me(cookie)).status).toBe(200);
    expect((await post('/api/auth/sign-out').set('Cookie', cookie)).status).toBe(204);
    expect((await me(cookie)).status).toBe(401);
  });
  it('when an admin disables a user, then that user\'s token stops working and sign-in is refused', async () => {
    const victim = await signIn(t.app, 't-metallurgist@test.example', TEST_PASSWORD);
    const res = await request(t.app).patch(`/api/users/${t.users.metallurgist}`).set('X-Ferrisight-Csrf', '1').set('Cookie', t.cookies.admin).send({ disabled: true, reason: 'Left the site' });
    expect(res.status).toBe(200);
    expect((await me(victim)).status).toBe(401);
    expect((await post('/api/auth/sign-in').send({ email: 't-metallurgist@test.example', password: TEST_PASSWORD })).status).toBe(401);
    await User.update({ disabled: false }, { where: { id: t.users.metallurgist } });
  });
});

describe('passwords', () => {
  it('when a password is changed, then the old sessions end and the new password works', async () => {
    const cookie = await signIn(t.app, 't-operator@test.example', TEST_PASSWORD);
    const bad = await post('/api/auth/password').set('Cookie', cookie).send({ currentPassword: TEST_PASSWORD, newPassword: 'short' });
    expect(bad.status).toBe(400);
    expect(bad.body.errors[0].path).toBe('newPassword');
    const next = 'a much longer passphrase that is still fine '.repeat(2).slice(0, 80);
    expect((await post('/api/auth/password').set('Cookie', cookie).send({ currentPassword: TEST_PASSWORD, newPassword: next })).status).toBe(204);
    expect((await me(cookie)).status).toBe(401);
    await signIn(t.app, 't-operator@test.example', next);
  });

  it('when hashes are made, then bcrypt cost is at least 10 (ASVS 5.0 11.4.2)', () => {
    expect(BCRYPT_COST).toBeGreaterThanOrEqual(10);
  });
});

describe('conventions', () => {
  it('when a route does not exist, then 404 JSON', async () => {
    const res = await request(t.app).get('/api/nothing-here').set('Cookie', t.cookies.admin);
    expect(res.status).toBe(404);
    expect(res.body.status).toBe(404);
  });
  it('when responses go out, then security headers are set', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    // HSTS only where PUBLIC_URL is https (tests/security/http-hardening.test.ts covers both).
    expect(res.headers['strict-transport-security']).toBeUndefined();
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
  });
});
