/**
 * The measured phases of bench/ingest.bench.ts (and the background load of bench/alarms.bench.ts):
 * stored-rate polling, the MariaDB insert ceiling, the broker pass-through ceiling, and the
 * publish → commit → socket.io latency with the API running as its own process.
 */
import bcrypt from 'bcryptjs';
import mqtt from 'mqtt';
import { io as connectClient } from 'socket.io-client';
import { issueToken } from '../../api/src/modules/auth/tokens.ts';
import { placeholders, toSqlTs, type Pool } from '../../api/src/db/pool.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { ALL_DEVICES_FILTER, type TankLive } from '../../shared/schemas/readings.ts';
import { latestMessageSchema, latestTopic, parseInternal } from '../../shared/schemas/internal-topics.ts';
import { runLoad, type LoadOptions } from '../../simulators/plant/load.ts';
import { SERVICE_PASSWORD, spawnPart, sleep, type Child } from '../../tests/reliability/lib/procs.ts';
import { quantile } from './bench-db.ts';

export type Load = Pick<LoadOptions, 'mqttUrl' | 'username' | 'password' | 'siteTag'>;
export type Quantiles = { n: number; p50: number; p99: number };
const q = (xs: number[]): Quantiles => ({ n: xs.length, p50: xs.length ? quantile(xs, 0.5) : NaN, p99: xs.length ? quantile(xs, 0.99) : NaN });
const now = () => toSqlTs(Date.now());

/** The load site and its device account; returns the device's credentials. */
export async function ensureBenchSite(pool: Pool, siteTag: string, _tanks: number): Promise<{ username: string; password: string }> {
  const password = 'bench-device-password';
  await pool.query('INSERT IGNORE INTO sites (tag, name, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?)', [siteTag, 'Bench', 'UTC', now(), now()]);
  await pool.query(
    'INSERT IGNORE INTO devices (site_id, username, password_hash, enabled, created_at, updated_at) SELECT id, ?, ?, 1, ?, ? FROM sites WHERE tag = ?',
    [`${siteTag}-device`, await bcrypt.hash(password, 4), now(), now(), siteTag]);
  return { username: `${siteTag}-device`, password };
}

/** Waits until `expected` more rows than `base` exist; rate = expected / (done − t0). With expected 0: the current count. */
export async function storedRate(pool: Pool, base: number, t0: number, expected: number, timeoutMs: number): Promise<{ count: number; rate: number }> {
  for (const until = Date.now() + timeoutMs; ;) {
    const [{ n }] = await pool.query('SELECT COUNT(*) AS n FROM readings');
    if (Number(n) >= base + expected) return { count: Number(n), rate: expected / ((Date.now() - t0) / 1000) };
    if (Date.now() > until) throw new Error(`only ${Number(n) - base} of ${expected} readings stored in ${timeoutMs / 1000} s`);
    await sleep(200);
  }
}

/** Rows/s of durable 1,000-row INSERTs of reading-shaped rows (one commit each, as a flush does). */
export async function insertCeiling(pool: Pool, rows: number): Promise<number> {
  const base = Date.now() - 86_400_000;
  const t0 = performance.now();
  for (let i = 0; i < rows; i += 1000) {
    const params: (string | number)[] = [];
    for (let j = i; j < i + 1000; j += 1) {
      params.push(900_000 + (j % 200), toSqlTs(base + j), j, 400 + (j % 40), 42, 0.61, 12.5, 0.92, 'ok', 1, now());
    }
    await pool.query(`INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES ${placeholders(1000, 11)}`, params);
  }
  return rows / ((performance.now() - t0) / 1000);
}

/**
 * The same load through a broker with nothing but a do-nothing QoS 1 subscriber: readings/s
 * (batch) or msg/s (single). `persistent`: the subscriber keeps a clean: false session, as the
 * ingest worker must (its unacknowledged messages survive a crash), so the broker stores every
 * in-flight message; with false it is a clean session, which the broker keeps in memory only.
 */
export async function passThrough(load: Load, port: number, o: Omit<LoadOptions, keyof Load>, persistent: boolean): Promise<number> {
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${port}`, {
    username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: `ferrisight-pt-${Date.now()}`, protocolVersion: 4, reconnectPeriod: 0, clean: !persistent,
  });
  let received = 0;
  sub.on('message', () => { received += 1; });
  await sub.subscribeAsync(ALL_DEVICES_FILTER, { qos: 1 });
  const t0 = Date.now();
  const r = await runLoad({ ...load, ...o });
  while (received < r.sentMessages) await sleep(20);
  const s = (Date.now() - t0) / 1000;
  // A clean: false session outlives the connection: drop its subscription, or the next run would also feed it.
  if (persistent) await sub.unsubscribeAsync(ALL_DEVICES_FILTER);
  await sub.endAsync();
  return (o.batch > 1 ? r.sentReadings : r.sentMessages) / s;
}

/**
 * publish → commit (the worker's post-commit live message on the internal topic) and commit →
 * socket.io (the API process, signed in as an operator), matched per (probe, ts); ts is the
 * reading's scheduled publish time in runLoad.
 */
export async function measureLatency(o: {
  pool: Pool; databaseUrl: string; mqttPort: number; load: Load; seconds: number; track: (name: string, c: Child) => void;
}): Promise<{ commit: Quantiles; socket: Quantiles; total: Quantiles }> {
  const secret = 'bench-jwt-secret-0123456789-0123456789-abcdef';
  const apiPort = await findFreePort();
  const api = spawnPart('api/src/server.ts', {
    DATABASE_URL: o.databaseUrl, MQTT_URL: `mqtt://127.0.0.1:${o.mqttPort}`, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD, JWT_SECRET: secret,
    PORT: String(apiPort), HOST: '127.0.0.1', WEB_DIST: '/nonexistent', FERRISIGHT_PROC: 'api',
  });
  o.track('api', api);
  for (let i = 0; i < 200; i += 1) {
    if (await fetch(`http://127.0.0.1:${apiPort}/api/health`).then((r) => r.ok, () => false)) break;
    await sleep(100);
  }
  const user = await o.pool.query(
    "INSERT INTO users (email, name, role, password_hash, disabled, tokens_valid_after, created_at, updated_at) VALUES (?, 'Bench', 'operator', 'x', 0, '1970-01-01 00:00:01', ?, ?)",
    [`bench-${Date.now()}@bench.example`, now(), now()]);
  const socket = connectClient(`http://127.0.0.1:${apiPort}`, { transports: ['websocket'], auth: { token: issueToken({ id: Number(user.insertId), role: 'operator' }, secret, 3600) } });
  await new Promise<void>((resolve, reject) => { socket.once('connect', () => resolve()); socket.once('connect_error', reject); });
  const committedAt = new Map<string, number>();
  const commit: number[] = [];
  const toSocket: number[] = [];
  const total: number[] = [];
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${o.mqttPort}`, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: `ferrisight-lat-${Date.now()}`, protocolVersion: 4, reconnectPeriod: 0 });
  sub.on('message', (t, buf) => {
    const at = Date.now();
    for (const r of parseInternal(latestMessageSchema, t, buf).readings) {
      committedAt.set(`${r.probeTag}|${r.ts}`, at);
      commit.push(at - Date.parse(r.ts));
    }
  });
  await sub.subscribeAsync(latestTopic(o.load.siteTag!), { qos: 0 });
  socket.on('tank:latest', (readings: TankLive[]) => {
    const at = Date.now();
    for (const r of readings) {
      // Only readings of this phase: the API also sends each tank's last value when a client joins.
      const c = committedAt.get(`${r.probeTag}|${r.ts}`);
      if (c === undefined) continue;
      toSocket.push(at - c);
      total.push(at - Date.parse(r.ts));
    }
  });
  await runLoad({ ...o.load, tanks: 200, hz: 10, batch: 10, durationS: o.seconds, seqStart: 5_000_000 });
  await sleep(2_000);
  socket.disconnect();
  await sub.endAsync();
  api.proc.kill('SIGTERM');
  await api.exited;
  return { commit: q(commit), socket: q(toSocket), total: q(total) };
}
