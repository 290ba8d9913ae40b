/**
 * One fault-injection rig: a migrated database with a site of numbered probes and a device
 * account, the broker and the ingest worker as child processes, and a device that drives a
 * NumberedStream through them. Tests kill and restart parts; the rig knows how to bring them back.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { createIngestPool, type Pool } from '../../../api/src/db/pool.ts';
import { findFreePort } from '../../../scripts/lib/ports.ts';
import { readingTopic } from '../../../shared/schemas/readings.ts';
import { addDevice, seedPlant } from '../../ingest/support.ts';
import { createTestDatabase, type TestDatabase } from '../../helpers/test-db.ts';
import { killAll, startBrokerProcess, startWorkerProcess, sleep, type Child } from './procs.ts';
import { NumberedStream, type StreamMessage, type StreamProbe } from './stream.ts';

export const DEVICE_PASSWORD = 'reliability-device-password';

export type Rig = {
  pool: Pool;
  databaseUrl: string;
  siteTag: string;
  probes: StreamProbe[];
  mqttPort: number;
  dataDir: string;
  broker: Child | null;
  worker: Child | null;
  startBroker(extra?: NodeJS.ProcessEnv): Promise<Child>;
  startWorker(extra?: NodeJS.ProcessEnv): Child;
  /** Publishes one reading of the warm-up probe and waits until it is stored: the pipeline is live. */
  waitLive(timeoutMs?: number): Promise<number>;
  device(clientId: string, opts?: mqtt.IClientOptions): Promise<MqttClient>;
  /** stepMs: ts step per seq (default 1 ms, i.e. time compressed; the soak uses real time). */
  stream(seqStart?: number, stepMs?: number): NumberedStream;
  close(): Promise<void>;
};

export async function createRig(o: { databaseUrl: string; probes: number; siteTag?: string; workerClientId?: string }): Promise<Rig> {
  const siteTag = o.siteTag ?? 'relia';
  const pool = createIngestPool(o.databaseUrl, 3);
  const tags = Array.from({ length: o.probes }, (_, i) => `R${String(i + 1).padStart(3, '0')}`);
  const ids = await seedPlant(pool, siteTag, [...tags, 'RWARM'].map((tag) => ({ tag })));
  await addDevice(pool, siteTag, 'relia-device', DEVICE_PASSWORD);
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-relia-'));
  const clientId = o.workerClientId ?? 'ferrisight-ingest-relia';
  const clients: MqttClient[] = [];
  let warmSeq = 0;

  const rig: Rig = {
    pool, databaseUrl: o.databaseUrl, siteTag, dataDir, broker: null, worker: null,
    probes: tags.map((tag) => ({ tag, id: ids.get(tag)! })),
    mqttPort: await findFreePort(),
    async startBroker(extra) {
      rig.broker = await startBrokerProcess({ port: rig.mqttPort, dataDir, databaseUrl: o.databaseUrl, extra });
      return rig.broker;
    },
    startWorker(extra) {
      rig.worker = startWorkerProcess({ mqttPort: rig.mqttPort, databaseUrl: o.databaseUrl, clientId, extra });
      return rig.worker;
    },
    async waitLive(timeoutMs = 30_000) {
      const started = Date.now();
      const warmId = ids.get('RWARM')!;
      const client = await rig.device(`relia-warm-${process.pid}`);
      try {
        // Re-send until stored: the first one may arrive before the worker's subscription exists.
        while (Date.now() - started < timeoutMs) {
          warmSeq += 1;
          const ts = new Date(Date.now() - 1000).toISOString();
          await client.publishAsync(readingTopic(siteTag, 'RWARM'), JSON.stringify({ ts, orpMv: 400, tempC: 40, seq: warmSeq }), { qos: 1 });
          for (let i = 0; i < 10; i += 1) {
            const [row] = await pool.query('SELECT 1 AS ok FROM readings WHERE probe_id = ? AND seq = ?', [warmId, warmSeq]);
            if (row) return Date.now() - started;
            await sleep(100);
          }
        }
        throw new Error(`pipeline not live within ${timeoutMs} ms; worker output:\n${rig.worker?.lines.join('\n')}`);
      } finally {
        await client.endAsync(true);
      }
    },
    async device(id, opts = {}) {
      const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${rig.mqttPort}`, {
        username: 'relia-device', password: DEVICE_PASSWORD, clientId: id, protocolVersion: 4,
        reconnectPeriod: 500, connectTimeout: 5_000, ...opts,
      });
      clients.push(c);
      return c;
    },
    stream: (seqStart, stepMs) => new NumberedStream({ siteTag, probes: rig.probes, seqStart, stepMs }),
    async close() {
      await Promise.all(clients.map((c) => c.endAsync(true).catch(() => undefined)));
      await pool.end().catch(() => undefined);
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
  return rig;
}

export type DriveResult = { messages: number; readings: number; elapsedMs: number };

/**
 * Sends `readingsPerS` readings a second as batch messages of `batch` readings for durationMs,
 * QoS 1 from one device. Offline, mqtt.js keeps publishes (and unacked in-flight ones) and
 * sends them after reconnecting: that is the device side of at-least-once. `twice` sends every
 * message a second time. `replayMs`: after a reconnect, also re-send what was published in the
 * last replayMs, acknowledged or not (the device rule for a broker that acks before it persists).
 * `during(elapsedMs)` runs between ticks (fault schedules).
 */
export async function drive(
  client: MqttClient, stream: NumberedStream,
  o: {
    readingsPerS: number; batch: number; durationMs: number; twice?: boolean; replayMs?: number;
    during?: (elapsedMs: number) => Promise<void> | void; onSend?: (m: StreamMessage) => void;
  },
): Promise<DriveResult & { acked: Promise<void>; replayed: () => number }> {
  const recent: { atMs: number; topic: string; payload: string }[] = [];
  let replayed = 0;
  let connects = 0;
  const onConnect = () => {
    if (!o.replayMs || connects++ === 0) return;
    const since = Date.now() - o.replayMs;
    for (const m of recent.filter((r) => r.atMs >= since)) {
      replayed += 1;
      pending.push(client.publishAsync(m.topic, m.payload, { qos: 1 }));
    }
  };
  if (o.replayMs) {
    connects = client.connected ? 1 : 0;
    client.on('connect', onConnect);
  }
  const tickMs = 50;
  const perTick = (o.readingsPerS * tickMs) / 1000 / o.batch;
  const pending: Promise<unknown>[] = [];
  const started = Date.now();
  let owed = 0;
  let messages = 0;
  for (let k = 0; Date.now() - started < o.durationMs; k += 1) {
    owed += perTick;
    for (; owed >= 1; owed -= 1) {
      const m = stream.next(o.batch);
      o.onSend?.(m);
      messages += 1;
      if (o.replayMs) {
        recent.push({ atMs: Date.now(), topic: m.topic, payload: m.payload });
        while (recent.length > 0 && recent[0].atMs < Date.now() - o.replayMs) recent.shift();
      }
      const sends = o.twice ? 2 : 1;
      for (let i = 0; i < sends; i += 1) {
        pending.push(client.publishAsync(m.topic, m.payload, { qos: 1 }).then(() => { if (i === 0) stream.markAcked(m.readings); }));
      }
    }
    await o.during?.(Date.now() - started);
    const wait = started + (k + 1) * tickMs - Date.now();
    if (wait > 0) await sleep(wait);
  }
  // Replays queued after the loop (a late reconnect) are awaited too.
  const acked = (async () => {
    for (let seen = 0; seen < pending.length;) {
      const upTo = pending.length;
      await Promise.all(pending.slice(seen, upTo));
      seen = upTo;
    }
    client.off('connect', onConnect);
  })();
  return { messages, readings: messages * o.batch, elapsedMs: Date.now() - started, acked, replayed: () => replayed };
}

/** A throw-away test database with a rig of `probes` on it, broker and worker running and live. */
export async function startLiveRig(probes: number): Promise<{ db: TestDatabase; rig: Rig }> {
  const db = await createTestDatabase();
  const rig = await createRig({ databaseUrl: db.databaseUrl, probes });
  await rig.startBroker();
  rig.startWorker();
  await rig.waitLive();
  return { db, rig };
}

/** Ends what startLiveRig started (every child process of the test included); safe after a failed start. */
export async function stopLiveRig(live: { db?: TestDatabase; rig?: Rig }): Promise<void> {
  await killAll();
  await live.rig?.close();
  await live.db?.drop();
}
