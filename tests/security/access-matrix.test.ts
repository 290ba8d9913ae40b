/**
 * The role × route × socket-event matrix (ASVS 8.2–8.3, 16.3.2).
 * tests/api/role-matrix.test.ts already proves which role gets which HTTP status; this file adds
 * what it does not: every refusal is logged (who, role, method, path), and the socket events —
 * generated from what the server actually listens to, so a new event cannot slip past the matrix.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { QueryTypes } from 'sequelize';
import { io as connectClient, type Socket } from 'socket.io-client';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { RouteInfo } from '../../api/src/lib/route-list.ts';
import { logger } from '../../api/src/lib/logger.ts';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import { attachRealtime } from '../../api/src/realtime/socket.ts';
import { ROLES, type Role } from '../../shared/schemas/auth.ts';
import { createTestApi, TEST_SECRET, type TestApi } from '../helpers/api.ts';

/**
 * Client → server socket events and who may use them; every signed-in role sees every alarm and
 * every site's live values. `served` tells whether the server acted on the event.
 */
type Served = (client: Socket, serverRooms: () => Set<string>) => Promise<boolean>;
const answered: Served = (client) =>
  new Promise<boolean>((resolve) => {
    client.once('alarm:event', () => resolve(true));
    setTimeout(() => resolve(false), 3_000);
  });
const SOCKET_EVENTS: Record<string, { allowed: readonly Role[]; args: unknown[]; served: Served }> = {
  'alarm:since': { allowed: ROLES, args: [0], served: answered },
  // A watch of one site moves the socket from every site's live room to that site's.
  'live:watch': {
    allowed: ROLES,
    args: [{ sites: ['kestrel'] }],
    served: async (_client, rooms) => {
      for (let i = 0; i < 60 && rooms().has('live:*'); i += 1) await new Promise((r) => setTimeout(r, 50));
      return !rooms().has('live:*');
    },
  },
};

let t: TestApi;
let server: http.Server;
let realtime: ReturnType<typeof attachRealtime>;
let url: string;
const sockets: Socket[] = [];

beforeAll(async () => {
  t = await createTestApi();
  server = http.createServer(t.app);
  realtime = attachRealtime(server, t.auth);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const [def] = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_definitions ORDER BY id LIMIT 1', { type: QueryTypes.SELECT });
  await applyAction(t.sequelize, { definitionId: def.id, action: 'activate', at: new Date(), actor: { userId: null, name: null, how: 'automatic' } });
});
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  await realtime?.close();
  await new Promise((r) => server?.close(r));
  await t?.close();
});

const connect = (role: Role | null): Promise<Socket | string> => new Promise((resolve) => {
  const auth = role ? { token: issueToken({ id: t.users[role], role }, TEST_SECRET, 3600) } : {};
  const s = connectClient(url, { transports: ['websocket'], reconnection: false, auth });
  sockets.push(s);
  s.once('connect', () => resolve(s));
  s.once('connect_error', (e) => resolve(e.message));
});

describe('HTTP refusals are logged (ASVS 16.3.2)', () => {
  it('when any role is refused any route (403), then a warning names the user, role, method and path', async () => {
    const warn = vi.spyOn(logger, 'warn');
    let refusals = 0;
    // Sign-out would end the very sessions the loop uses; it is open to every role anyway.
    for (const r of (t.app.locals.routes as RouteInfo[]).filter((x) => x.path !== '/api/auth/sign-out')) {
      for (const role of ROLES) {
        warn.mockClear();
        const res = await request(t.app)[r.method.toLowerCase() as 'get'](r.path.replace(/:[A-Za-z]+/g, '1'))
          .set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send({});
        if (res.status !== 403) continue;
        refusals += 1;
        const logged = warn.mock.calls.find((c) => typeof c[0] === 'object' && (c[0] as { role?: string }).role === role);
        expect(logged, `${role} ${r.method} ${r.path}`).toBeDefined();
        expect(logged![0]).toMatchObject({ userId: t.users[role], method: r.method });
      }
    }
    warn.mockRestore();
    console.log(`${refusals} role × route refusals, each logged`);
    expect(refusals).toBeGreaterThan(20);
  }, 120_000);
});

describe('socket events × roles', () => {
  it('when the server registers client events, then each one is in the matrix', async () => {
    const s = (await connect('operator')) as Socket;
    await new Promise((r) => setTimeout(r, 200));
    const serverSide = realtime.io.sockets.sockets.get(s.id!)!;
    const listened = serverSide.eventNames().map(String).filter((e) => !['disconnect', 'disconnecting', 'error'].includes(e));
    expect(listened.sort()).toEqual(Object.keys(SOCKET_EVENTS).sort());
  });

  it('when nobody is signed in, then no socket opens at all (every event is out of reach)', async () => {
    expect(await connect(null)).toBe('unauthorized');
  });

  for (const [event, rule] of Object.entries(SOCKET_EVENTS)) {
    for (const role of ROLES) {
      const allowed = rule.allowed.includes(role);
      it(`when ${role} emits ${event}, then it is ${allowed ? 'served' : 'refused'}`, async () => {
        const s = (await connect(role)) as Socket;
        await new Promise((r) => setTimeout(r, 200));
        const rooms = () => realtime.io.sockets.sockets.get(s.id!)?.rooms ?? new Set<string>();
        const got = rule.served(s, rooms);
        s.emit(event, ...rule.args);
        expect(await got).toBe(allowed);
      });
    }
  }

  it('when a client emits events the server does not offer, then nothing changes and the socket stays healthy', async () => {
    const s = (await connect('operator')) as Socket;
    const before = await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM alarm_events', { type: QueryTypes.SELECT });
    for (const e of ['alarm:acknowledge', 'alarm:shelve', 'admin:simulator', 'users:update', '__proto__', 'constructor']) s.emit(e, { id: 1, all: true });
    await new Promise((r) => setTimeout(r, 500));
    const after = await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM alarm_events', { type: QueryTypes.SELECT });
    expect(after[0].n).toBe(before[0].n);
    expect(s.connected).toBe(true);
  });
});
