/**
 * The device edge of the embedded broker: a correct device is never stranded by one message it
 * may not send, one gateway cannot take every connection or another gateway's client id, and a
 * late reading is converted with the calibration valid at its own time.
 */
import type { MqttClient } from 'mqtt';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { batchTopic, MAX_PAYLOAD_BYTES, readingTopic } from '../../shared/schemas/readings.ts';
import { startBroker, type RunningBroker } from '../../ingest/broker/start-broker.ts';
import { MAX_PACKET_BYTES } from '../../ingest/broker/packet-limit.ts';
import { startWorker, type RunningWorker } from '../../ingest/start-worker.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { SERVICE_PASSWORD, addDevice, connect, createIngestPool, iso, seedPlant, tempDir, waitFor } from './support.ts';

let db: TestDatabase;
let pool: Pool;
let broker: RunningBroker;
let worker: RunningWorker;
let probeIds: Map<string, number>;
const tmp = tempDir();
const open: MqttClient[] = [];
const PER_GATEWAY = 2;

const startTestWorker = () => startWorker({
  databaseUrl: db.databaseUrl, mqttUrl: `mqtt://127.0.0.1:${broker.port}`, username: 'ferrisight-service',
  password: SERVICE_PASSWORD, clientId: 'ferrisight-ingest-edge', retentionDays: 90,
});

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 2);
  probeIds = await seedPlant(pool, 'kestrel', [{ tag: 'A1-ORP' }, { tag: 'A2-ORP' }, { tag: 'A3-ORP' }]);
  await seedPlant(pool, 'osprey', [{ tag: 'O1-ORP' }]);
  for (const [site, user] of [['kestrel', 'gw-kestrel'], ['kestrel', 'gw-greedy'], ['osprey', 'gw-osprey'], ['kestrel', 'gw-a'], ['kestrel', 'gw-b']]) {
    await addDevice(pool, site, user, 'gateway-password');
  }
  broker = await startBroker({
    port: 0, databaseUrl: db.databaseUrl, dataDir: tmp.dir, servicePassword: SERVICE_PASSWORD,
    maxConnections: 12, reservedServiceConnections: 4, maxConnectionsPerGateway: PER_GATEWAY,
  });
  worker = await startTestWorker();
  await worker.subscribed;
});

afterAll(async () => {
  await Promise.all(open.map((c) => c.endAsync(true).catch(() => undefined)));
  await worker?.stop();
  await broker?.close();
  await pool?.end();
  await db?.drop();
  tmp.remove();
});

async function gateway(username: string, clientId = `${username}-${Math.random().toString(36).slice(2, 8)}`, opts = {}): Promise<MqttClient> {
  const c = await connect(broker.port, { username, password: 'gateway-password', clientId, ...opts });
  open.push(c);
  return c;
}
const closeAll = () => Promise.all(open.splice(0).map((c) => c.endAsync(true).catch(() => undefined)));
const tryGateway = (username: string, clientId?: string) => gateway(username, clientId).then(() => true, () => false);
const withTimeout = <T>(p: Promise<T>, ms: number, what: string) =>
  Promise.race([p, new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`${what}: no answer within ${ms} ms`)), ms))]);
const count = async (sql: string, params: unknown[] = []) => Number((await pool.query(sql, params))[0].n);
const reading = (seq: number, tsMs = Date.now() - 1_000, orpMv = 476) => JSON.stringify({ ts: iso(tsMs), orpMv, tempC: 25, seq });

describe('a device is never stranded by a message it may not send', () => {
  it('when a gateway sends an oversized payload, another site\'s topic and an internal topic, then each is dead-lettered and acknowledged, and the same connection\'s next 100 good readings are all stored', async () => {
    const c = await gateway('gw-kestrel');
    let closed = false;
    c.on('close', () => { closed = true; });
    // Each publishAsync resolves only on its PUBACK.
    await withTimeout(c.publishAsync(readingTopic('kestrel', 'A1-ORP'), Buffer.alloc(MAX_PAYLOAD_BYTES + 1, 0x20), { qos: 1 }), 5_000, 'oversized');
    await withTimeout(c.publishAsync(readingTopic('osprey', 'O1-ORP'), reading(1), { qos: 1 }), 5_000, 'cross-site');
    await withTimeout(c.publishAsync('ferrisight/internal/v1/cache/invalidate', '{}', { qos: 1 }), 5_000, 'internal');
    const letters = await pool.query("SELECT reason_kind, gateway FROM dead_letters WHERE gateway = 'gw-kestrel' ORDER BY id");
    expect(letters.map((l: { reason_kind: string }) => l.reason_kind)).toEqual(['too-large', 'forbidden-topic', 'forbidden-topic']);
    for (let seq = 10; seq < 110; seq++) {
      await withTimeout(c.publishAsync(readingTopic('kestrel', 'A1-ORP'), reading(seq, Date.now() - 200_000 + seq * 1000), { qos: 1 }), 5_000, `reading ${seq}`);
    }
    const stored = await waitFor(async () => {
      const n = await count('SELECT COUNT(*) AS n FROM readings WHERE probe_id = ? AND seq BETWEEN 10 AND 109', [probeIds.get('A1-ORP')]);
      return n === 100 ? n : undefined;
    });
    expect(stored).toBe(100);
    expect(closed).toBe(false);
    expect(await count('SELECT COUNT(*) AS n FROM readings WHERE probe_id = ?', [probeIds.get('O1-ORP')])).toBe(0);
  });

  it(`when a packet is larger than the protocol limit (${MAX_PACKET_BYTES} bytes), then the broker closes that connection`, async () => {
    const c = await gateway('gw-kestrel');
    const closed = new Promise<boolean>((resolve) => c.once('close', () => resolve(true)));
    c.publish(readingTopic('kestrel', 'A1-ORP'), Buffer.alloc(MAX_PACKET_BYTES + 10, 0x20), { qos: 1 });
    expect(await Promise.race([closed, new Promise<boolean>((r) => setTimeout(() => r(false), 5_000))])).toBe(true);
  });
});

describe('connections and client ids', () => {
  it('when a gateway opens connections beyond its limit, then the extra ones are refused while the ingest worker restarts and reconnects and another site\'s gateway connects', async () => {
    // Earlier tests' connections of gw-kestrel are not this gateway's.
    const results: boolean[] = [];
    for (let i = 0; i < PER_GATEWAY + 5; i++) results.push(await tryGateway('gw-greedy'));
    expect(results.filter(Boolean).length).toBe(PER_GATEWAY);
    await worker.stop();
    worker = await startTestWorker();
    await withTimeout(worker.subscribed, 10_000, 'worker resubscribe');
    expect(await tryGateway('gw-osprey')).toBe(true);
    const c = await gateway('gw-kestrel');
    await c.publishAsync(readingTopic('kestrel', 'A2-ORP'), reading(1), { qos: 1 });
    await waitFor(async () => (await count('SELECT COUNT(*) AS n FROM readings WHERE probe_id = ?', [probeIds.get('A2-ORP')])) === 1);
  });

  it('when devices hold every connection they may have, then Ferrisight\'s own services can still connect', async () => {
    // 12 in all, 4 kept for the services: devices may hold 8.
    for (const u of ['gw-a', 'gw-b', 'gw-osprey', 'gw-kestrel']) while (await tryGateway(u)) { /* fill this gateway's share */ }
    const service = await connect(broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-api-edge-test' });
    open.push(service);
    expect(service.connected).toBe(true);
    expect(await tryGateway('gw-b')).toBe(false);
  });

  it('when a device uses another gateway\'s client id, then it is refused and the first stays connected', async () => {
    await closeAll();
    const first = await gateway('gw-kestrel', 'shared-client-id');
    let closed = false;
    first.on('close', () => { closed = true; });
    expect(await tryGateway('gw-osprey', 'shared-client-id')).toBe(false);
    await new Promise((r) => setTimeout(r, 500));
    expect(closed).toBe(false);
    await first.publishAsync(readingTopic('kestrel', 'A3-ORP'), reading(1), { qos: 1 });
  });

  it.each([['another case', 'GW-KESTREL'], ['a trailing space', 'gw-kestrel ']])('when a username differs by %s, then the login is refused', async (_l, username) => {
    expect(await tryGateway(username)).toBe(false);
  });
});

describe('dead letters and conflicts are kept once', () => {
  beforeEach(closeAll);
  it('when the same bad batch arrives three times, then each refused element is one row', async () => {
    const c = await gateway('gw-kestrel');
    const batch = JSON.stringify({ readings: Array.from({ length: 20 }, (_, i) => ({ probe: `NOPE-${i}`, ts: iso(Date.now() - 5_000), orpMv: 400, tempC: 30, seq: i })) });
    for (let i = 0; i < 3; i++) await c.publishAsync(batchTopic('kestrel'), batch, { qos: 1 });
    await waitFor(async () => (await count("SELECT COUNT(*) AS n FROM dead_letters WHERE reason_kind = 'unknown-probe'")) >= 20);
    await new Promise((r) => setTimeout(r, 500));
    expect(await count("SELECT COUNT(*) AS n FROM dead_letters WHERE reason_kind = 'unknown-probe'")).toBe(20);
  });

  it('when the same conflicting reading arrives three times, then one conflict row is kept', async () => {
    const c = await gateway('gw-kestrel');
    const ts = Date.now() - 30_000;
    await c.publishAsync(readingTopic('kestrel', 'A3-ORP'), reading(500, ts, 476), { qos: 1 });
    for (let i = 0; i < 3; i++) await c.publishAsync(readingTopic('kestrel', 'A3-ORP'), reading(500, ts, 480), { qos: 1 });
    await waitFor(async () => (await count('SELECT COUNT(*) AS n FROM reading_conflicts WHERE probe_id = ?', [probeIds.get('A3-ORP')])) >= 1);
    await new Promise((r) => setTimeout(r, 500));
    expect(await count('SELECT COUNT(*) AS n FROM reading_conflicts WHERE probe_id = ?', [probeIds.get('A3-ORP')])).toBe(1);
  });
});

describe('late readings', () => {
  beforeEach(closeAll);
  it('when a reading published 10 minutes late was taken before a new calibration took effect, then it is stored with the calibration valid at its time', async () => {
    const probeId = probeIds.get('A2-ORP')!;
    const [{ tank_id: tankId }] = await pool.query('SELECT tank_id FROM probes WHERE id = ?', [probeId]);
    const now = Date.now();
    // Version 2 (E°' 0.700 V) took effect 5 minutes ago; version 1 (0.675 V) before that.
    await pool.query(
      "INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 2, 0.700, 0, ?, 'test', ?)",
      [tankId, new Date(now - 300_000).toISOString().replace('T', ' ').replace('Z', ''), new Date(now).toISOString().replace('T', ' ').replace('Z', '')]);
    const service = await connect(broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-edge-invalidate' });
    await service.publishAsync('ferrisight/internal/v1/cache/invalidate', '{}', { qos: 1 });
    await service.endAsync();
    await new Promise((r) => setTimeout(r, 300));
    const c = await gateway('gw-kestrel');
    await c.publishAsync(readingTopic('kestrel', 'A2-ORP'), reading(900, now - 600_000), { qos: 1 });
    await c.publishAsync(readingTopic('kestrel', 'A2-ORP'), reading(901, now - 1_000), { qos: 1 });
    const rows = await waitFor(async () => {
      const r = await pool.query('SELECT seq, calibration_version, ratio FROM readings WHERE probe_id = ? AND seq IN (900, 901) ORDER BY seq', [probeId]);
      return r.length === 2 ? r : undefined;
    });
    // Light's solution, +476 mV against a 0.199 V reference at 25 °C is Eh 0.675 V (Standard Methods 2580;
    // ASTM D1498): against E°' 0.675 V the ratio is 1.
    expect(rows.map((r: { calibration_version: number }) => r.calibration_version)).toEqual([1, 2]);
    expect(rows[0].ratio).toBeCloseTo(1, 6);
    expect(rows[1].ratio).toBeLessThan(1);
  });
});
