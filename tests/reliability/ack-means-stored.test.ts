/**
 * An acknowledgement means stored: a device that never re-sends publishes 1,000 readings/s
 * (QoS 1, MQTT 3.1.1 §4.3.2: the PUBACK transfers ownership of the message to the receiver)
 * while the broker is SIGKILLed five times, each kill in the same tick as a PUBACK reaches the
 * device for the first of a burst of messages (the rest of the burst still in flight). Every
 * reading the device saw acknowledged must end up in the readings table.
 *
 * "Never re-sends": each connection is a new clean-session client with reconnecting off, and a
 * publish whose PUBACK did not arrive before the connection dropped is forgotten, not re-sent.
 * Readings due while the device is offline are not sent at all.
 */
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SEQ_SPAN } from './lib/compare.ts';
import { sleep } from './lib/procs.ts';
import { createRig, DEVICE_PASSWORD, stopLiveRig, type Rig } from './lib/rig.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import type { StreamReading } from './lib/stream.ts';

const READINGS_PER_S = 1_000;
const BATCH = 4;
const KILLS = 5;
/** Streaming time between one resume and the next kill. */
const RUN_MS = 6_000;

let live: { db?: TestDatabase; rig?: Rig } = {};

beforeAll(async () => {
  const db = await createTestDatabase();
  const rig = await createRig({ databaseUrl: db.databaseUrl, probes: 20 });
  live = { db, rig };
  await rig.startBroker();
  // info: its "connected to broker" lines say whether each reconnect found the session.
  rig.startWorker({ LOG_LEVEL: 'info' });
  await rig.waitLive();
}, 90_000);

afterAll(async () => {
  await stopLiveRig(live);
});

const key = (r: Pick<StreamReading, 'probeId' | 'seq'>) => `${r.probeId}:${r.seq}`;

describe('an acknowledgement from the embedded broker means stored', () => {
  it('when a device that never re-sends publishes 1,000 readings/s and the broker is SIGKILLed five times, then every reading it saw acknowledged is stored', async () => {
    const rig = live.rig!;
    const SEQ0 = 3 * SEQ_SPAN;
    const stream = rig.stream(SEQ0);
    const acked = new Set<string>();
    let forgotten = 0; // publishes whose PUBACK never came (the device drops them)
    let offlineReadings = 0;
    let client: MqttClient | null = null;
    let killDue = false;
    let waitingForFirstAck = false;
    let kills = 0;
    const killedAt: number[] = [];
    const ackResumeMs: number[] = [];
    const storeResumeMs: number[] = [];
    let restarting: Promise<void> = Promise.resolve();

    const storedSince = async (): Promise<number> => {
      const [{ n }] = await rig.pool.query<{ n: number }[]>(
        `SELECT COUNT(*) AS n FROM readings WHERE probe_id IN (${rig.probes.map((p) => p.id).join(',')}) AND seq > ?`, [SEQ0]);
      return Number(n);
    };

    // The kill: synchronous, in the callback that reports a PUBACK.
    let killedClient: MqttClient | null = null;
    const killNow = (c: MqttClient) => {
      killDue = false;
      waitingForFirstAck = true;
      killedClient = c;
      kills += 1;
      const at = Date.now();
      killedAt.push(at);
      rig.broker!.proc.kill('SIGKILL');
      restarting = (async () => {
        const before = await storedSince();
        await rig.broker!.exited;
        await rig.startBroker();
        void (async () => {
          while ((await storedSince()) <= before && Date.now() - at < 60_000) await sleep(50);
          storeResumeMs.push(Date.now() - at);
        })();
      })();
    };

    const connect = async (): Promise<MqttClient> => {
      for (;;) {
        try {
          const c = await mqtt.connectAsync(`mqtt://127.0.0.1:${rig.mqttPort}`, {
            username: 'relia-device', password: DEVICE_PASSWORD, clientId: 'relia-forgetful', protocolVersion: 4,
            clean: true, reconnectPeriod: 0, connectTimeout: 3_000,
          });
          // A dropped connection is the end of this client: end(true) fails its unacknowledged publishes.
          c.once('close', () => {
            if (client === c) client = null;
            c.end(true);
          });
          return c;
        } catch {
          await sleep(100);
        }
      }
    };

    client = await connect();
    let connecting: Promise<void> | null = null;
    const started = Date.now();
    let owed = 0;
    let nextKillAt = started + RUN_MS;
    for (let tick = 0; kills < KILLS || ackResumeMs.length < KILLS || Date.now() < nextKillAt; tick += 1) {
      owed += (READINGS_PER_S * 0.05) / BATCH;
      if (!client && !connecting) {
        connecting = connect().then((c) => {
          client = c;
          connecting = null;
        });
      }
      for (let inTick = 0; owed >= 1; owed -= 1, inTick += 1) {
        const c = client;
        const first = inTick === 0;
        if (!c) {
          offlineReadings += BATCH;
          continue;
        }
        const m = stream.next(BATCH);
        c.publish(m.topic, m.payload, { qos: 1 }, (err) => {
          if (err) {
            forgotten += 1;
            return;
          }
          for (const r of m.readings) acked.add(key(r));
          stream.markAcked(m.readings);
          if (waitingForFirstAck && c !== killedClient) {
            waitingForFirstAck = false;
            ackResumeMs.push(Date.now() - killedAt.at(-1)!);
            nextKillAt = Date.now() + RUN_MS;
          }
          // The PUBACK of a tick's first message: the rest of that tick's messages are still in flight.
          if (killDue && first && c === client && rig.broker?.proc.exitCode === null && rig.broker.proc.signalCode === null) killNow(c);
        });
      }
      if (kills < KILLS && !killDue && !waitingForFirstAck && Date.now() >= nextKillAt) killDue = true;
      const wait = started + (tick + 1) * 50 - Date.now();
      if (wait > 0) await sleep(wait);
      if (Date.now() - started > 150_000) throw new Error(`device made ${kills} of ${KILLS} kills in 150 s; broker:\n${rig.broker?.lines.slice(-30).join('\n')}`);
    }
    await restarting;
    // The last publishes: acknowledged or forgotten once the client ends.
    const last = client as MqttClient | null;
    await sleep(2_000);
    await last?.endAsync(true);
    const streamedMs = Date.now() - started;

    // Every acknowledged reading stored (the worker may still be catching up).
    const ids = rig.probes.map((p) => p.id).join(',');
    const drainStarted = Date.now();
    let stored = new Set<string>();
    let rows = 0;
    for (;;) {
      const found = await rig.pool.query<{ probe_id: number; seq: number }[]>(
        `SELECT probe_id, seq FROM readings WHERE probe_id IN (${ids}) AND seq > ?`, [SEQ0]);
      rows = found.length;
      stored = new Set(found.map((r) => key({ probeId: r.probe_id, seq: r.seq })));
      if ([...acked].every((k) => stored.has(k)) || Date.now() - drainStarted > 60_000) break;
      await sleep(250);
    }
    const lost = [...acked].filter((k) => !stored.has(k));
    const [{ c: conflicts }] = await rig.pool.query<{ c: number }[]>(
      `SELECT COUNT(*) AS c FROM reading_conflicts WHERE probe_id IN (${ids}) AND incoming_seq > ?`, [SEQ0]);
    const duplicates = rows - stored.size;
    const sessions = rig.worker!.lines.filter((l) => l.includes('"connected to broker"')).map((l) => JSON.parse(l).sessionPresent as boolean);
    const s = (ms: number[]) => ms.map((x) => `${(x / 1000).toFixed(1)} s`).join(', ');
    console.log(`device that never re-sends, ${READINGS_PER_S} readings/s in ${BATCH}-reading messages, broker SIGKILL ×${kills} over ${(streamedMs / 1000).toFixed(0)} s: `
      + `${acked.size} readings acknowledged, ${stored.size} stored (${stored.size - (acked.size - lost.length)} of them sent but never acknowledged), `
      + `lost ${lost.length}, duplicates ${duplicates}, conflicts ${conflicts}; ${forgotten} messages forgotten unacknowledged, ${offlineReadings} readings not sent while offline; `
      + `kill → first PUBACK: ${s(ackResumeMs)}; kill → first reading stored: ${s(storeResumeMs)}; all stored ${((Date.now() - drainStarted) / 1000).toFixed(1)} s after the end`
      + (lost.length ? `; missing e.g. ${lost.slice(0, 10).join(' ')}` : ''));

    expect(kills).toBe(KILLS);
    expect(ackResumeMs).toHaveLength(KILLS);
    // Enough traffic to mean something: at least half the offered readings acknowledged.
    expect(acked.size).toBeGreaterThan((READINGS_PER_S * KILLS * RUN_MS) / 1000 / 2);
    expect(lost).toEqual([]);
    expect(duplicates).toBe(0);
    expect(Number(conflicts)).toBe(0);
    // The worker's session survived every broker kill (the first connect made it).
    expect(sessions.slice(1).length).toBeGreaterThanOrEqual(KILLS);
    expect(sessions.slice(1).every(Boolean)).toBe(true);
  }, 240_000);
});
