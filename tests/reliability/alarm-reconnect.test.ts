/**
 * 200 socket.io clients force-disconnected while alarms are raised →
 * after reconnecting, each has every alarm event id (0 missed). The client side is what the web
 * app does: `auth` is a function, so every (re)connect sends `lastAlarmEventId`, and the API
 * replays from alarm_events (api/src/realtime/alarm-feed.ts). Short form: 5 s down;
 * FERRISIGHT_LONG=1: 30 s down.
 */
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { QueryTypes } from 'sequelize';
import { io as connectClient, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import { attachRealtime } from '../../api/src/realtime/socket.ts';
import { createTestApi, TEST_SECRET, type TestApi } from '../helpers/api.ts';
import { sleep } from './lib/procs.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const CLIENTS = 200;
const DOWN_MS = LONG ? 30_000 : 5_000;

let t: TestApi;
let server: http.Server;
let realtime: ReturnType<typeof attachRealtime>;
let url: string;
const clients: { socket: Socket; ids: Set<number>; last: number }[] = [];

beforeAll(async () => {
  t = await createTestApi();
  server = http.createServer(t.app);
  realtime = attachRealtime(server, t.auth);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', () => r()));
  url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  for (const c of clients) c.socket.disconnect();
  await realtime?.close();
  await new Promise((r) => server?.close(r));
  await t?.close();
});

/** Toggles activate / clear over the seeded definitions: every call is one alarm event. */
function eventSource(definitionIds: number[]) {
  const active = new Map<number, boolean>();
  let n = 0;
  return async () => {
    const id = definitionIds[n++ % definitionIds.length];
    const on = !active.get(id);
    const r = await applyAction(t.sequelize, { definitionId: id, action: on ? 'activate' : 'clear', at: new Date(), actor: { userId: null, name: null, how: 'automatic' } });
    if (r.ok) active.set(id, on);
  };
}

const allEventIds = async () => (await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_events ORDER BY id', { type: QueryTypes.SELECT })).map((r) => r.id);

describe('alarm feed across forced disconnects', () => {
  it(`when ${CLIENTS} clients are force-disconnected for ${DOWN_MS / 1000} s while alarms are raised, then each receives every missed alarm id after reconnecting`, async () => {
    const defs = (await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_definitions ORDER BY id LIMIT 8', { type: QueryTypes.SELECT })).map((r) => r.id);
    expect(defs.length).toBeGreaterThan(0);
    const raise = eventSource(defs);
    const startId = (await allEventIds()).at(-1) ?? 0;
    const token = issueToken({ id: t.users.operator, role: 'operator' }, TEST_SECRET, 3600);

    await Promise.all(Array.from({ length: CLIENTS }, () => new Promise<void>((resolve, reject) => {
      const c = { socket: undefined as unknown as Socket, ids: new Set<number>(), last: startId };
      c.socket = connectClient(url, {
        transports: ['websocket'], reconnection: false,
        auth: (cb) => cb({ token, lastAlarmEventId: c.last }),
      });
      c.socket.on('alarm:event', (e: { id: number }) => {
        c.ids.add(e.id);
        c.last = Math.max(c.last, e.id);
      });
      c.socket.once('connect', () => resolve());
      c.socket.once('connect_error', reject);
      clients.push(c);
    })));

    for (let i = 0; i < 10; i += 1) await raise();
    await sleep(1_000);
    // Force-disconnect everyone from the server side; they come back only when told to.
    realtime.io.disconnectSockets(true);
    await sleep(200);
    expect(clients.every((c) => !c.socket.connected)).toBe(true);
    const downUntil = Date.now() + DOWN_MS;
    let missedWhileDown = 0;
    while (Date.now() < downUntil) {
      await raise();
      missedWhileDown += 1;
      await sleep(100);
    }
    // Reconnect in a burst while alarms keep coming: the replay and the live feed must not leave a gap between them.
    const reconnectAt = Date.now();
    const raising = (async () => { for (let i = 0; i < 20; i += 1) { await raise(); await sleep(25); } })();
    await Promise.all(clients.map((c) => new Promise<void>((resolve) => { c.socket.once('connect', () => resolve()); c.socket.connect(); })));
    await raising;
    const expected = (await allEventIds()).filter((id) => id > startId);
    const deadline = Date.now() + 15_000;
    while (Date.now() < deadline && clients.some((c) => c.ids.size < expected.length)) await sleep(100);

    const missing = clients.map((c) => expected.filter((id) => !c.ids.has(id)).length);
    const complete = missing.filter((m) => m === 0).length;
    console.log(`${CLIENTS} clients, ${DOWN_MS / 1000} s down: ${expected.length} events (${missedWhileDown} while down); `
      + `${complete}/${CLIENTS} clients have every id ${((Date.now() - reconnectAt) / 1000).toFixed(1)} s after reconnecting; missed ids in total ${missing.reduce((a, b) => a + b, 0)}`);
    expect(missing.every((m) => m === 0)).toBe(true);
  }, 90_000);
});
