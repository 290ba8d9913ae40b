import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { batchTopic } from '../../shared/schemas/readings.ts';
import type { RunningBroker } from '../../ingest/broker/start-broker.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { SERVICE_PASSWORD, addDevice, brokerFor, connect, createIngestPool, iso, seedPlant, tempDir, waitFor } from './support.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const CLIENT_ID = 'ferrisight-ingest-crash';
const PROBES = ['K1', 'K2', 'K3', 'K4', 'K5'];

let db: TestDatabase;
let pool: Pool;
let broker: RunningBroker;
const tmp = tempDir();
const children: ChildProcess[] = [];

/** Runs the real entry point as its own process, so SIGKILL means what it means in production. */
async function spawnWorker(ackMode: string): Promise<ChildProcess> {
  const subscribed = new Promise<void>((resolve) => {
    const onSub = (_subs: unknown, client: { id: string }) => {
      if (client.id === CLIENT_ID) { broker.broker.off('subscribe', onSub); resolve(); }
    };
    broker.broker.on('subscribe', onSub);
  });
  const child = spawn(process.execPath, ['--import', 'tsx', 'ingest/worker.ts'], {
    cwd: root,
    stdio: ['ignore', process.env.DEBUG_CRASH ? 'inherit' : 'ignore', 'inherit'],
    env: {
      ...process.env, NODE_ENV: 'test', LOG_LEVEL: process.env.DEBUG_CRASH ? 'debug' : 'error', DATABASE_URL: db.databaseUrl,
      MQTT_URL: `mqtt://127.0.0.1:${broker.port}`, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD, INGEST_CLIENT_ID: CLIENT_ID,
      INGEST_ACK_MODE: ackMode,
    },
  });
  children.push(child);
  await subscribed;
  return child;
}

const exited = (child: ChildProcess) => new Promise<number | null>((resolve) => child.once('exit', (code) => resolve(code)));

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 2);
  await seedPlant(pool, 'kestrel', PROBES.map((tag) => ({ tag })));
  await addDevice(pool, 'kestrel', 'dev-crash', 'crash-password');
  broker = await brokerFor(db.databaseUrl, tmp.dir);
});

afterAll(async () => {
  for (const c of children) if (c.exitCode === null && c.signalCode === null) c.kill('SIGKILL');
  await broker?.close();
  await pool?.end();
  await db?.drop();
  tmp.remove();
});

describe('worker crash recovery', () => {
  it.each(['pipelined', 'serial'])('when the worker (%s acks) is SIGKILLed mid-stream and restarted, then every seq is stored exactly once', async (ackMode) => {
    await pool.query('DELETE FROM readings');
    let worker = await spawnWorker(ackMode);
    const device = await connect(broker.port, { username: 'dev-crash', password: 'crash-password', clientId: `dev-crash-${ackMode}` });
    const MESSAGES = 300;
    const base = Date.now() - (ackMode === 'serial' ? 240_000 : 120_000);
    let seq = 0;
    const sends: Promise<unknown>[] = [];
    for (let m = 0; m < MESSAGES; m += 1) {
      // Two readings per probe per message: 10 readings a message, 3 000 in all.
      const readings = [0, 1].flatMap(() => {
        seq += 1;
        return PROBES.map((probe) => ({ probe, ts: iso(base + seq * 10), orpMv: 400 + (seq % 50), tempC: 40, seq }));
      });
      sends.push(device.publishAsync(batchTopic('kestrel'), JSON.stringify({ readings }), { qos: 1 }));
      if (m === 100) {
        worker.kill('SIGKILL');
        await exited(worker);
      }
      if (m === 200) worker = await spawnWorker(ackMode);
      await new Promise((r) => setTimeout(r, 3));
    }
    await Promise.all(sends);
    await device.endAsync();

    const total = MESSAGES * 10;
    await waitFor(async () => {
      const [{ n }] = await pool.query('SELECT COUNT(*) AS n FROM readings');
      if (process.env.DEBUG_CRASH) console.error('stored', n, 'of', total);
      return n >= total;
    }, 30_000);
    const perProbe = await pool.query(
      'SELECT probe_id, COUNT(*) AS n, COUNT(DISTINCT seq) AS distinct_seq, MIN(seq) AS lo, MAX(seq) AS hi FROM readings GROUP BY probe_id');
    expect(perProbe).toHaveLength(PROBES.length);
    for (const p of perProbe) expect(p).toMatchObject({ n: seq, distinct_seq: seq, lo: 1, hi: seq });
    const [{ c }] = await pool.query('SELECT COUNT(*) AS c FROM reading_conflicts');
    const [{ d }] = await pool.query('SELECT COUNT(*) AS d FROM dead_letters');
    expect({ conflicts: c, deadLetters: d }).toEqual({ conflicts: 0, deadLetters: 0 });

    // And a graceful stop: SIGTERM finishes the flush and exits 0.
    worker.kill('SIGTERM');
    expect(await exited(worker)).toBe(0);
  }, 60_000);
});
