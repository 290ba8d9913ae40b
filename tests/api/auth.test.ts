import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { User } from '../../api/src/db/models.ts';
import { BCRYPT_COST, createAuthService } from '../../api/src/modules/auth/auth.service.ts';
import { LoginThrottle } from '../../api/src/modules/auth/login-throttle.ts';
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

describe('throttling', () => {
  it('when an account fails 5 times, then the 6th attempt gets 429 with Retry-After, even with the right password', async () => {
    const throttled = createApp({ auth: createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 }, new LoginThrottle(5, 20)), ttlS: 3600 });
    const attempt = (password: string) => request(throttled).post('/api/auth/sign-in').set('X-Ferrisight-Csrf', '1').send({ email: 't-supervisor@test.example', password });
    for (let i = 0; i < 5; i++) expect((await attempt('wrong-password')).status).toBe(401);
    const blocked = await attempt(TEST_PASSWORD);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('when the window has passed, then sign-in works again', () => {
    const th = new LoginThrottle(2, 20, 1000);
    th.fail('a@x', '1.1.1.1', 0);
    th.fail('a@x', '1.1.1.1', 10);
    expect(th.retryAfterS('a@x', '1.1.1.1', 20)).toBeGreaterThan(0);
    expect(th.retryAfterS('a@x', '1.1.1.1', 1011)).toBe(0);
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
    expect(res.headers['strict-transport-security']).toMatch(/max-age=31536000/);
    expect(res.headers['access-control-allow-origin']).toBeUndefined();
  });
});
