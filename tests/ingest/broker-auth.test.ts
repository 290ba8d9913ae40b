import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { MqttClient } from 'mqtt';
import { MAX_PAYLOAD_BYTES, readingTopic } from '../../shared/schemas/readings.ts';
import type { RunningBroker } from '../../ingest/broker/start-broker.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { SERVICE_PASSWORD, addDevice, brokerFor, connect, createIngestPool, seedPlant, tempDir } from './support.ts';

let db: TestDatabase;
let pool: Pool;
let broker: RunningBroker;
let observer: MqttClient;
const seen: string[] = [];
const tmp = tempDir();

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 2);
  await seedPlant(pool, 'kestrel', [{ tag: 'A1-ORP' }]);
  await seedPlant(pool, 'osprey', [{ tag: 'O1-ORP' }]);
  await addDevice(pool, 'kestrel', 'dev-kestrel', 'right-password');
  await addDevice(pool, 'kestrel', 'dev-off', 'right-password');
  await pool.query("UPDATE devices SET enabled = 0 WHERE username = 'dev-off'");
  broker = await brokerFor(db.databaseUrl, tmp.dir);
  observer = await connect(broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-observer' });
  await observer.subscribeAsync('#');
  observer.on('message', (topic) => seen.push(topic));
});

afterAll(async () => {
  await observer?.endAsync();
  await broker?.close();
  await pool?.end();
  await db?.drop();
  tmp.remove();
});

const device = (clientId = `dev-kestrel-${Math.random().toString(36).slice(2, 8)}`) =>
  connect(broker.port, { username: 'dev-kestrel', password: 'right-password', clientId });

/** Publishes at QoS 1; true when the broker acknowledged it, kept the connection and delivered nothing. */
async function publishRefused(client: MqttClient, topic: string, payload: string | Buffer): Promise<boolean> {
  let closed = false;
  client.once('close', () => { closed = true; });
  const acked = await Promise.race([client.publishAsync(topic, payload, { qos: 1 }).then(() => true), new Promise<boolean>((r) => setTimeout(() => r(false), 3_000))]);
  await new Promise((r) => setTimeout(r, 100));
  const open = !closed;
  await client.endAsync(true);
  return acked && open && !seen.includes(topic);
}

describe('broker authentication and topic rules', () => {
  it.each([
    ['no credentials', {}],
    ['a wrong password', { username: 'dev-kestrel', password: 'wrong-password' }],
    ['an unknown user', { username: 'nobody', password: 'right-password' }],
    ['a disabled device', { username: 'dev-off', password: 'right-password' }],
    ['the service user with a wrong password', { username: 'ferrisight-service', password: 'not-the-service-password' }],
    ['a device using a reserved service client id', { username: 'dev-kestrel', password: 'right-password', clientId: 'ferrisight-ingest-1' }],
  ])('when a client connects with %s, then the connection is refused', async (_label, creds) => {
    await expect(connect(broker.port, { clientId: 'c-refused', ...creds })).rejects.toThrow(/Bad username or password|Not authorized/);
  });

  it('when a device publishes under its own site, then the reading is delivered', async () => {
    const c = await device();
    // A reading that keeps the device contract (one that breaks it stops at the broker: edge-screen.test.ts).
    await c.publishAsync(readingTopic('kestrel', 'A1-ORP'), JSON.stringify({ ts: new Date().toISOString(), orpMv: 401.2, tempC: 35, seq: 1 }), { qos: 1 });
    await c.endAsync();
    await new Promise((r) => setTimeout(r, 100));
    expect(seen).toContain(readingTopic('kestrel', 'A1-ORP'));
  });

  it.each([
    ['another site', readingTopic('osprey', 'O1-ORP'), '{}'],
    ['an internal topic', 'ferrisight/internal/v1/cache/invalidate', '{}'],
    ['$SYS', '$SYS/fake/heartbeat', '{}'],
    ['a payload over 256 KiB', readingTopic('kestrel', 'A1-BIG'), Buffer.alloc(MAX_PAYLOAD_BYTES + 1, 0x20)],
  ])('when a device publishes to %s, then the broker acknowledges it, delivers nothing and keeps the connection', async (_label, topic, payload) => {
    expect(await publishRefused(await device(), topic, payload)).toBe(true);
  });

  it('when a device subscribes, then the subscription is refused (SUBACK 0x80) and nothing reaches it', async () => {
    const c = await device();
    const received: string[] = [];
    c.on('message', (topic) => received.push(topic));
    // mqtt.js turns a 0x80 SUBACK into this error.
    await expect(c.subscribeAsync('ferrisight/#', { qos: 1 })).rejects.toThrow(/Subscribe error/);
    await observer.publishAsync('ferrisight/internal/v1/kestrel/latest', '{}', { qos: 1 });
    await new Promise((r) => setTimeout(r, 200));
    await c.endAsync();
    expect(received).toEqual([]);
  });

  it('when the service account publishes internally and subscribes, then both are allowed', async () => {
    const svc = await connect(broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-svc-test' });
    const granted = await svc.subscribeAsync('ferrisight/internal/#', { qos: 1 });
    await svc.publishAsync('ferrisight/internal/v1/cache/invalidate', '{}', { qos: 1 });
    await svc.endAsync();
    expect(granted[0].qos).toBe(1);
  });
});
