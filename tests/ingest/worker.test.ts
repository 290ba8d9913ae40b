import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MqttClient } from 'mqtt';
import { batchTopic, readingTopic, type TankLive } from '../../shared/schemas/readings.ts';
import { latestTopic } from '../../shared/schemas/internal-topics.ts';
import { startWorker, type RunningWorker } from '../../ingest/start-worker.ts';
import type { RunningBroker } from '../../ingest/broker/start-broker.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { SERVICE_PASSWORD, addDevice, brokerFor, connect, createIngestPool, iso, seedPlant, tempDir, waitFor } from './support.ts';

let db: TestDatabase;
let pool: Pool;
let broker: RunningBroker;
let worker: RunningWorker;
let device: MqttClient;
let service: MqttClient;
let probeIds: Map<string, number>;
const tmp = tempDir();

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 2);
  probeIds = await seedPlant(pool, 'kestrel', [{ tag: 'LIGHT-1' }, { tag: 'P2' }, { tag: 'NOCAL', formalPotentialV: null }]);
  await seedPlant(pool, 'osprey', [{ tag: 'OTHER-1' }]);
  await addDevice(pool, 'kestrel', 'dev-kestrel', 'device-password-1');
  // The worker's own checks, as behind a site's broker (MQTT_URL); edge-screen.test.ts covers the embedded broker's.
  broker = await brokerFor(db.databaseUrl, tmp.dir, 0, { screenAtEdge: false });
  worker = await startWorker({
    databaseUrl: db.databaseUrl, mqttUrl: `mqtt://127.0.0.1:${broker.port}`, username: 'ferrisight-service',
    password: SERVICE_PASSWORD, clientId: 'ferrisight-ingest-test', retentionDays: 90,
  });
  device = await connect(broker.port, { username: 'dev-kestrel', password: 'device-password-1', clientId: 'dev-kestrel-1' });
  service = await connect(broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-test-observer' });
  await worker.subscribed;
});

afterAll(async () => {
  await device?.endAsync();
  await service?.endAsync();
  await worker?.stop();
  await broker?.close();
  await pool?.end();
  await db?.drop();
  tmp.remove();
});

const rowsFor = (probeId: number) => pool.query('SELECT * FROM readings WHERE probe_id = ? ORDER BY ts', [probeId]);
const deadLetters = () => pool.query('SELECT topic, payload, payload_bytes, reason FROM dead_letters ORDER BY id');

describe('ingest worker, end to end over MQTT', () => {
  it('when Light\'s solution reads +476 mV against a 0.199 V reference at 25 °C, then the stored ratio is 1.000', async () => {
    // Source: Standard Methods 2580 / ASTM D1498 : Eh 0.675 V, E°′ 0.675 V → ratio 1.
    const live: TankLive[] = [];
    await service.subscribeAsync(latestTopic('kestrel'));
    service.on('message', (topic, payload) => {
      if (topic === latestTopic('kestrel')) live.push(...JSON.parse(payload.toString()).readings);
    });
    const ts = Date.now() - 1_000;
    await device.publishAsync(readingTopic('kestrel', 'LIGHT-1'), JSON.stringify({ ts: iso(ts), orpMv: 476, tempC: 25, seq: 1 }), { qos: 1 });
    const [row] = await waitFor(async () => { const r = await rowsFor(probeIds.get('LIGHT-1')!); return r.length ? r : undefined; });
    expect(row.eh_v).toBeCloseTo(0.675, 9);
    expect(row.ratio).toBeCloseTo(1.0, 9);
    expect(row.ferric_fraction).toBeCloseTo(0.5, 9);
    expect(row.flag).toBe('ok');
    expect(row.calibration_version).toBe(1);
    expect(row.seq).toBe(1);
    const pushed = await waitFor(async () => live.find((l) => l.probeTag === 'LIGHT-1'));
    expect(pushed.ratio).toBeCloseTo(1.0, 9);
    expect(pushed.ts).toBe(iso(ts));
  });

  it('when a batch mixes good and bad readings, then the good ones are stored and each bad one is dead-lettered with its index', async () => {
    const now = Date.now();
    const readings = [
      { probe: 'P2', ts: iso(now - 3_000), orpMv: 400, tempC: 30, seq: 1 },
      { probe: 'P2', ts: iso(now - 2_000), orpMv: 'high', tempC: 30, seq: 2 },
      { probe: 'GHOST', ts: iso(now - 2_000), orpMv: 400, tempC: 30, seq: 3 },
      { probe: 'OTHER-1', ts: iso(now - 2_000), orpMv: 400, tempC: 30, seq: 4 },
      { probe: 'P2', ts: iso(now + 120_000), orpMv: 400, tempC: 30, seq: 5 },
      { probe: 'P2', ts: iso(now - 91 * 86_400_000), orpMv: 400, tempC: 30, seq: 6 },
      { probe: 'NOCAL', ts: iso(now - 2_000), orpMv: 400, tempC: 30, seq: 7 },
      { probe: 'P2', ts: iso(now - 1_000), orpMv: 410, tempC: 30, seq: 8 },
    ];
    await device.publishAsync(batchTopic('kestrel'), JSON.stringify({ readings }), { qos: 1 });
    const letters = await waitFor(async () => { const d = await deadLetters(); return d.length >= 6 ? d : undefined; });
    const reasons = letters.map((l: { reason: string }) => l.reason);
    expect(reasons[0]).toMatch(/^readings\[1\]: orpMv/);
    expect(reasons).toContainEqual(expect.stringMatching(/^readings\[2\]: unknown probe 'GHOST'/));
    expect(reasons).toContainEqual(expect.stringMatching(/^readings\[3\]: probe 'OTHER-1' does not belong to site 'kestrel'/));
    expect(reasons).toContainEqual(expect.stringMatching(/^readings\[4\]: .*in the future/));
    expect(reasons).toContainEqual(expect.stringMatching(/^readings\[5\]: .*older than the raw retention window/));
    expect(reasons).toContainEqual(expect.stringMatching(/^readings\[6\]: no calibration for tank/));
    const stored = await rowsFor(probeIds.get('P2')!);
    expect(stored.map((r: { seq: number }) => r.seq)).toEqual([1, 8]);
  });

  it('when messages are malformed, then each lands in dead_letters with its reason and the worker keeps storing', async () => {
    const before = (await deadLetters()).length;
    const p2 = readingTopic('kestrel', 'P2');
    const ts = iso(Date.now() - 500);
    await device.publishAsync(p2, '{"ts": ', { qos: 1 });
    await device.publishAsync(p2, Buffer.from([0x7b, 0xff, 0xfe, 0x7d]), { qos: 1 });
    await device.publishAsync(p2, JSON.stringify({ ts, orpMv: 400, seq: 9 }), { qos: 1 });
    await device.publishAsync(p2, JSON.stringify({ ts, orpMv: 400, tempC: 30, seq: 10, extra: 1 }), { qos: 1 });
    await device.publishAsync('ferrisight/v1/kestrel/P2/oops', JSON.stringify({ ts, orpMv: 400, tempC: 30, seq: 11 }), { qos: 1 });
    await service.publishAsync(readingTopic('nowhere', 'P2'), JSON.stringify({ ts, orpMv: 400, tempC: 30, seq: 12 }), { qos: 1 });
    await device.publishAsync(p2, JSON.stringify({ ts, orpMv: 420, tempC: 30, seq: 13 }), { qos: 1 });
    const letters = await waitFor(async () => { const d = await deadLetters(); return d.length >= before + 6 ? d.slice(before) : undefined; });
    // One flush may hold several of these, so the table's order is not the publish order.
    const reasons = letters.map((l: { reason: string }) => l.reason);
    const notUtf8 = letters.find((l: { reason: string }) => l.reason === 'payload is not UTF-8');
    expect(notUtf8?.payload).toBe('hex:7bfffe7d');
    expect(notUtf8?.payload_bytes).toBe(4);
    for (const pattern of [/^invalid JSON/, /^invalid reading: tempC: /, /^invalid reading: .*extra/, /^unknown topic/, /^unknown site 'nowhere'$/]) {
      expect(reasons).toContainEqual(expect.stringMatching(pattern));
    }
    expect(reasons).toHaveLength(6);
    await waitFor(async () => (await rowsFor(probeIds.get('P2')!)).some((r: { seq: number }) => r.seq === 13));
  });

  it('when the same reading arrives twice, then one row is stored; when it arrives with another value, then a conflict is logged and the first value kept', async () => {
    const id = probeIds.get('P2')!;
    const ts = iso(Date.now() - 10_000);
    const body = JSON.stringify({ ts, orpMv: 390, tempC: 31, seq: 20 });
    await device.publishAsync(readingTopic('kestrel', 'P2'), body, { qos: 1 });
    await device.publishAsync(readingTopic('kestrel', 'P2'), body, { qos: 1 });
    await device.publishAsync(readingTopic('kestrel', 'P2'), JSON.stringify({ ts, orpMv: 395, tempC: 31, seq: 21 }), { qos: 1 });
    const conflicts = await waitFor(async () => {
      const c = await pool.query('SELECT * FROM reading_conflicts WHERE probe_id = ?', [id]);
      return c.length ? c : undefined;
    });
    expect(conflicts).toHaveLength(1);
    expect(conflicts[0]).toMatchObject({ stored_orp_mv: 390, incoming_orp_mv: 395, incoming_seq: 21, source: 'mqtt' });
    const rows = (await rowsFor(id)).filter((r: { seq: number }) => r.seq === 20 || r.seq === 21);
    expect(rows).toHaveLength(1);
    expect(rows[0].orp_mv).toBe(390);
    expect(worker.metrics.duplicates).toBeGreaterThanOrEqual(1);
  });

  it('when a calibration changes and the API announces it, then the next reading is converted with the new version', async () => {
    const id = probeIds.get('LIGHT-1')!;
    const [{ tank_id: tankId }] = await pool.query('SELECT tank_id FROM probes WHERE id = ?', [id]);
    await pool.query(
      "INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 2, 0.700, 0, '2026-01-02', 'test', '2026-01-02')",
      [tankId]);
    await service.publishAsync('ferrisight/internal/v1/cache/invalidate', '{}', { qos: 1 });
    await new Promise((r) => setTimeout(r, 300));
    await device.publishAsync(readingTopic('kestrel', 'LIGHT-1'), JSON.stringify({ ts: iso(Date.now() - 100), orpMv: 476, tempC: 25, seq: 2 }), { qos: 1 });
    const row = await waitFor(async () => (await rowsFor(id)).find((r: { seq: number }) => r.seq === 2));
    expect(row.calibration_version).toBe(2);
    // Eh 0.675 V against E°′ 0.700 V: 25 mV below → ratio exp(−0.025/0.025693) ≈ 0.378.
    expect(row.ratio).toBeCloseTo(Math.exp(-0.025 / 0.0256926), 3);
  });
});
