import { EventEmitter } from 'node:events';
import { QueryTypes } from 'sequelize';
import { io as connect, type Socket } from 'socket.io-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ProbesOffline } from '../../shared/schemas/internal-topics.ts';
import type { TankLive } from '../../shared/schemas/readings.ts';
import type { ClientToServerEvents, ServerToClientEvents } from '../../shared/schemas/socket-events.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { startRealtimeServer, type RealtimeServer } from '../helpers/realtime-server.ts';

// Screens receive only the sites they watch: rooms per site for live values (live:watch).
let t: TestApi;
let rt: RealtimeServer | undefined;
let url: string;
const source = new EventEmitter<{ latest: [TankLive[]]; offline: [ProbesOffline] }>();
const sockets: Socket[] = [];
const tanks: { site: string; tankId: number; probeId: number; probeTag: string }[] = [];

beforeAll(async () => {
  t = await createTestApi();
  // The demo plant has one site; a second, generated one beside it.
  const now = new Date();
  const [siteId] = await t.sequelize.query("INSERT INTO sites (tag, name, time_zone, created_at, updated_at) VALUES ('second', 'Second site', 'UTC', ?, ?)", { replacements: [now, now], type: QueryTypes.INSERT });
  const [circuitId] = await t.sequelize.query("INSERT INTO circuits (site_id, tag, name, position, created_at, updated_at) VALUES (?, 'C', 'Circuit', 1, ?, ?)", { replacements: [siteId, now, now], type: QueryTypes.INSERT });
  const [tankId] = await t.sequelize.query("INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at) VALUES (?, 'Z1', 'Tank Z1', 1, 100, 0.5, 2, ?, ?)", { replacements: [circuitId, now, now], type: QueryTypes.INSERT });
  await t.sequelize.query(
    "INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at) VALUES (?, 'Z1-ORP', 'agcl-sat', 0.199, -0.001, 10, 5, ?, 1, ?, ?)",
    { replacements: [tankId, now, now, now], type: QueryTypes.INSERT });
  const rows = await t.sequelize.query<{ site: string; tankId: number; probeId: number; probeTag: string }>(
    `SELECT s.tag AS site, t.id AS tankId, p.id AS probeId, p.tag AS probeTag FROM probes p JOIN tanks t ON t.id = p.tank_id
       JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id WHERE p.active = 1 ORDER BY p.id`, { type: QueryTypes.SELECT });
  tanks.push(...rows);
  rt = await startRealtimeServer(t.app, t.auth, source);
  url = rt.url;
});
afterAll(async () => {
  for (const s of sockets) s.disconnect();
  await rt?.close();
  await t?.close();
});

async function screen(watch?: string[] | 'all'): Promise<{ sites: Set<string>; tanks: Set<number>; staleProbes: Set<number> }> {
  const seen = { sites: new Set<string>(), tanks: new Set<number>(), staleProbes: new Set<number>() };
  const socket: Socket<ServerToClientEvents, ClientToServerEvents> = connect(url, { transports: ['websocket'], reconnection: false, auth: { token: t.cookies.operator.split('=').slice(1).join('=') } });
  sockets.push(socket);
  socket.on('tank:latest', (readings) => {
    for (const r of readings) {
      seen.tanks.add(r.tankId);
      seen.sites.add(tanks.find((x) => x.tankId === r.tankId)!.site);
    }
  });
  socket.on('probe:freshness', (f) => {
    if (f.stale) seen.staleProbes.add(f.probeId);
  });
  await new Promise<void>((resolve, reject) => {
    socket.once('connect', () => resolve());
    socket.once('connect_error', reject);
  });
  if (watch) socket.emit('live:watch', { sites: watch });
  return seen;
}

const reading = (x: (typeof tanks)[number], tsMs: number): TankLive => ({
  tankId: x.tankId, probeId: x.probeId, probeTag: x.probeTag, ts: new Date(tsMs).toISOString(), orpMv: 450, tempC: 40,
  ehV: 0.65, ratio: 1.2, ferricFraction: 0.55, flag: 'ok', calibrationVersion: 1,
});

async function until(check: () => boolean, ms = 5000): Promise<void> {
  const end = Date.now() + ms;
  while (!check()) {
    if (Date.now() > end) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 25));
  }
}

describe('live values per watched site', () => {
  it('when screens watch one site, all sites or say nothing, then each receives exactly its sites', async () => {
    const sites = [...new Set(tanks.map((x) => x.site))];
    expect(sites.length).toBeGreaterThanOrEqual(2);
    const one = await screen(['second']);
    const all = await screen('all');
    const silent = await screen();
    const bogus = await screen(['no-such-site', 'second']);
    await new Promise((r) => setTimeout(r, 300));
    // Two rounds, 1 s apart, so the per-tank pacing lets each tank through twice.
    for (const round of [0, 1]) {
      source.emit('latest', tanks.map((x) => reading(x, Date.now() + round)));
      await new Promise((r) => setTimeout(r, 1000));
    }
    await until(() => all.tanks.size === tanks.length && silent.tanks.size === tanks.length && one.tanks.size >= 1 && bogus.tanks.size >= 1);
    expect([...one.sites]).toEqual(['second']);
    expect([...bogus.sites]).toEqual(['second']);
    expect([...all.sites].sort()).toEqual([...sites].sort());
    expect([...silent.sites].sort()).toEqual([...sites].sort());
  });

  it('when a watch message is malformed, then it is ignored and the screen keeps what it had', async () => {
    const s = await screen(['second']);
    const socket = sockets[sockets.length - 1] as unknown as Socket;
    socket.emit('live:watch', { sites: 42 });
    socket.emit('live:watch', 'everything');
    await new Promise((r) => setTimeout(r, 300));
    source.emit('latest', tanks.map((x) => reading(x, Date.now() + 5_000)));
    await until(() => s.tanks.size >= 1);
    await new Promise((r) => setTimeout(r, 300));
    expect([...s.sites]).toEqual(['second']);
  });

  it('when a source announces probes offline (a Sparkplug death), then their staleness goes to screens watching that site or all sites, and no other', async () => {
    const second = tanks.find((x) => x.site === 'second')!;
    const otherSite = tanks.find((x) => x.site !== 'second')!.site;
    const one = await screen(['second']);
    const all = await screen('all');
    const other = await screen([otherSite]);
    await new Promise((r) => setTimeout(r, 300));
    // Dated after every reading the earlier cases sent (some ahead of now), so only the death makes it stale.
    source.emit('offline', { probeIds: [second.probeId], atMs: Date.now() + 60_000 });
    await until(() => one.staleProbes.has(second.probeId) && all.staleProbes.has(second.probeId));
    await new Promise((r) => setTimeout(r, 300));
    expect(other.staleProbes.has(second.probeId)).toBe(false);
  });
});
