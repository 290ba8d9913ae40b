/**
 * Token checks on socket.io (tests/api/auth.test.ts covers the same tokens on HTTP): forged, alg none,
 * wrong algorithm, expired, not-yet-valid, disabled user, after sign-out → handshake refused and
 * logged (ASVS 9.1–9.2, 7.4, 16.3.1); a live socket is cut ≤ 5 s after its token's exp (middleware
 * runs once per connection: auth0-socketio-jwt#38), at sign-out and when the user is disabled.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import jwt from 'jsonwebtoken';
import { io as connectClient, type Socket } from 'socket.io-client';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { User } from '../../api/src/db/models.ts';
import { logger } from '../../api/src/lib/logger.ts';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import { attachRealtime } from '../../api/src/realtime/socket.ts';
import { createTestApi, signIn, TEST_PASSWORD, TEST_SECRET, type TestApi } from '../helpers/api.ts';

let t: TestApi;
let server: http.Server;
let realtime: ReturnType<typeof attachRealtime>;
let url: string;
const open: Socket[] = [];

beforeAll(async () => {
  t = await createTestApi({ seedPlant: false });
  server = http.createServer(t.app);
  realtime = attachRealtime(server, t.auth);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});
afterEach(() => vi.restoreAllMocks());
afterAll(async () => {
  for (const s of open) s.disconnect();
  await realtime?.close();
  await new Promise((r) => server?.close(r));
  await t?.close();
});

/** Resolves 'connected' or the connect_error message (no retries: a refusal must stay a refusal). */
function tryConnect(auth: Record<string, unknown>, headers: Record<string, string> = {}): Promise<{ result: string; socket: Socket }> {
  const socket = connectClient(url, { transports: ['websocket'], reconnection: false, auth, extraHeaders: headers, timeout: 5_000 });
  open.push(socket);
  return new Promise((resolve) => {
    socket.once('connect', () => resolve({ result: 'connected', socket }));
    socket.once('connect_error', (err) => resolve({ result: err.message, socket }));
  });
}

const sign = (claims: object, secret: string, opts: jwt.SignOptions) =>
  jwt.sign({ role: 'engineer', iatMs: Date.now(), ...claims }, secret, { subject: String(t.users.engineer), audience: 'ferrisight', issuer: 'ferrisight', ...opts });

describe('socket.io handshake tokens', () => {
  it('when the token is valid, then the socket connects', async () => {
    expect((await tryConnect({ token: issueToken({ id: t.users.engineer, role: 'engineer' }, TEST_SECRET, 3600) })).result).toBe('connected');
  });

  const bad: Array<[string, () => string]> = [
    ['a forged signature', () => issueToken({ id: t.users.engineer, role: 'admin' }, 'another-secret-another-secret-another-secret', 3600)],
    ['alg none', () => sign({}, '', { algorithm: 'none', expiresIn: 3600 })],
    ['another algorithm (HS512)', () => sign({}, TEST_SECRET, { algorithm: 'HS512', expiresIn: 3600 })],
    ['an expired token', () => sign({ exp: Math.floor(Date.now() / 1000) - 60, iatMs: Date.now() - 7_200_000 }, TEST_SECRET, { algorithm: 'HS256' })],
    ['a not-yet-valid token (nbf)', () => sign({}, TEST_SECRET, { algorithm: 'HS256', expiresIn: 3600, notBefore: 600 })],
    ['a wrong audience', () => sign({}, TEST_SECRET, { algorithm: 'HS256', expiresIn: 3600, audience: 'someone-else' })],
    ['garbage', () => 'not.a.jwt'],
  ];
  it.each(bad)('when the handshake carries %s, then it is refused and the refusal is logged', async (_label, make) => {
    const warn = vi.spyOn(logger, 'warn');
    expect((await tryConnect({ token: make() })).result).toBe('unauthorized');
    expect(warn.mock.calls.some((c) => /socket/i.test(String(c[1] ?? c[0])))).toBe(true);
  });

  it('when there is no token at all, then the handshake is refused', async () => {
    expect((await tryConnect({})).result).toBe('unauthorized');
  });

  it('when the user is disabled, then an otherwise valid token is refused', async () => {
    const token = issueToken({ id: t.users.operator, role: 'operator' }, TEST_SECRET, 3600, Date.now() - 1000);
    await User.update({ disabled: true }, { where: { id: t.users.operator } });
    try {
      expect((await tryConnect({ token })).result).toBe('unauthorized');
    } finally {
      await User.update({ disabled: false }, { where: { id: t.users.operator } });
    }
  });

  it('when the session cookie was signed out, then the cookie no longer opens a socket', async () => {
    const cookie = await signIn(t.app, 't-supervisor@test.example', TEST_PASSWORD);
    expect((await tryConnect({}, { Cookie: cookie })).result).toBe('connected');
    await request(t.app).post('/api/auth/sign-out').set('Cookie', cookie).set('X-Ferrisight-Csrf', '1').expect(204);
    expect((await tryConnect({}, { Cookie: cookie })).result).toBe('unauthorized');
  });
});

describe('live sockets are cut when the session ends', () => {
  const cutAfter = (socket: Socket) => new Promise<number>((resolve) => socket.once('disconnect', () => resolve(Date.now())));

  it('when the token expires, then the socket is disconnected within 5 s of exp', async () => {
    const token = issueToken({ id: t.users.engineer, role: 'engineer' }, TEST_SECRET, 3);
    const expMs = (jwt.decode(token) as { exp: number }).exp * 1000;
    const { result, socket } = await tryConnect({ token });
    expect(result).toBe('connected');
    const cut = await cutAfter(socket);
    console.log(`socket cut ${cut - expMs} ms after exp`);
    expect(cut - expMs).toBeLessThanOrEqual(5_000);
    expect(cut - expMs).toBeGreaterThan(-1_000);
  }, 15_000);

  it('when the user signs out elsewhere or is disabled, then the open socket is closed at once', async () => {
    const cookie = await signIn(t.app, 't-metallurgist@test.example', TEST_PASSWORD);
    const a = await tryConnect({}, { Cookie: cookie });
    const b = await tryConnect({ token: issueToken({ id: t.users.metallurgist, role: 'metallurgist' }, TEST_SECRET, 3600) });
    const started = Date.now();
    const cuts = Promise.all([cutAfter(a.socket), cutAfter(b.socket)]);
    await request(t.app).post('/api/auth/sign-out').set('Cookie', cookie).set('X-Ferrisight-Csrf', '1').expect(204);
    expect(Math.max(...(await cuts)) - started).toBeLessThan(2_000);

    const c = await tryConnect({ token: issueToken({ id: t.users.metallurgist, role: 'metallurgist' }, TEST_SECRET, 3600) });
    expect(c.result).toBe('connected');
    const cut = cutAfter(c.socket);
    await request(t.app).patch(`/api/users/${t.users.metallurgist}`).set('Cookie', t.cookies.admin).set('X-Ferrisight-Csrf', '1').send({ disabled: true, reason: 'Left the site' }).expect(200);
    expect((await cut) - Date.now()).toBeLessThan(2_000);
    await User.update({ disabled: false }, { where: { id: t.users.metallurgist } });
  }, 15_000);
});
