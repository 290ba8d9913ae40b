/**
 * The broker (ingest/broker.ts, level persistence) kill -9'd and
 * restarted → sessions survive, 0 loss of PUBACKed readings, resume ≤ 5 s.
 *
 * What this settles: aedes 1.2.0 alone does not store before the PUBACK. For QoS 1,
 * lib/handlers/publish.js writes the PUBACK first and only then runs broker.publish(), whose
 * enqueueOffline step puts the message into the level store for persistent subscribers, so a kill
 * between the two loses a message the device was told is safe. The embedded broker stores first
 * (ingest/broker/store-before-ack.ts, on by default): the window tests kill it in the same tick as
 * a PUBACK with the setting on (0 lost, asserted) and off (the window measured). The first test is
 * the device that re-sends its last seconds after a reconnect (the store ignores exact repeats);
 * ack-means-stored.test.ts is the device that never re-sends. QoS 2 (MQTT 3.1.1 §4.3.3): aedes
 * stores before its PUBREC; the last test kills the broker between PUBREC and PUBREL.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, waitForCount } from './lib/compare.ts';
import { kill9, killAll, sleep } from './lib/procs.ts';
import { createRig, drive, type Rig } from './lib/rig.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
let db: TestDatabase;
let rig: Rig;

beforeAll(async () => {
  db = await createTestDatabase();
  rig = await createRig({ databaseUrl: db.databaseUrl, probes: 20 });
  await rig.startBroker();
  rig.startWorker({ LOG_LEVEL: 'info' });
  await rig.waitLive();
});

afterAll(async () => {
  await killAll();
  await rig?.close();
  await db?.drop();
});

const idsSql = () => rig.probes.map((p) => p.id).join(',');
const storedCount = async () => Number((await rig.pool.query(`SELECT COUNT(*) AS n FROM readings WHERE probe_id IN (${idsSql()})`))[0].n);

describe('broker kill -9 with level persistence', () => {
  it('when the broker is killed mid-stream and restarted, then sessions survive and, with the device re-sending its last 15 s, nothing is lost or duplicated', async () => {
    const device = await rig.device('relia-dev-brokerkill', { clean: false });
    const stream = rig.stream();
    const kills = LONG ? 5 : 1;
    const durationMs = LONG ? 60_000 : 15_000;
    const resumeMs: number[] = [];
    let done = 0;
    const run = await drive(device, stream, {
      readingsPerS: 2_000, batch: 10, durationMs, replayMs: 15_000,
      during: async (elapsed) => {
        if (done >= kills || elapsed < ((done + 0.4) * durationMs) / kills) return;
        done += 1;
        const before = await storedCount();
        const killedAt = Date.now();
        await kill9(rig.broker!);
        await rig.startBroker();
        // Resume: kill → the first reading stored through the restarted broker (restart time included).
        void (async () => {
          while ((await storedCount()) <= before + 100) await sleep(50);
          resumeMs.push(Date.now() - killedAt);
        })();
      },
    });
    await run.acked;
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 60_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    const sessions = rig.worker!.lines.filter((l) => l.includes('"connected to broker"')).map((l) => JSON.parse(l).sessionPresent as boolean);
    console.log(formatComparison(`broker kill -9 ×${kills}`, c));
    console.log(`worker connects (sessionPresent): ${JSON.stringify(sessions)}; device re-sent ${run.replayed()} messages; resume after kill: ${resumeMs.map((ms) => `${(ms / 1000).toFixed(1)} s`).join(', ')}`);

    expect(drained.reached).toBe(true);
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
    // The first connect made the session; every reconnect after a broker restart must find it.
    expect(sessions.slice(1).length).toBeGreaterThanOrEqual(kills);
    expect(sessions.slice(1).every(Boolean)).toBe(true);
    // Resume includes starting the broker process (node + tsx); on a loaded 2-core box that alone can
    // take seconds, so the short form only prints it and the long form (run file by file) asserts the 5 s resume.
    if (LONG) expect(Math.max(...resumeMs)).toBeLessThanOrEqual(5_000);
  }, 120_000);

  /**
   * The window between PUBACK and store. The worker is stopped first, so a reading can survive
   * only in the broker's on-disk session, not in MariaDB; the kill comes in the same tick as the
   * 1,000th PUBACK reaches the device, as close to "the device was told it is safe" as a test gets.
   */
  const ackWindow = async (storeBeforeAck: 'on' | 'off', seq0: number) => {
    await kill9(rig.worker!);
    await kill9(rig.broker!);
    await rig.startBroker({ MQTT_STORE_BEFORE_ACK: storeBeforeAck });
    const device = await rig.device(`relia-dev-window-${storeBeforeAck}`, { clean: false, reconnectPeriod: 0 });
    const stream = rig.stream(seq0);
    let ackedMessages = 0;
    const ackedKeys = new Set<string>();
    const TOTAL = 2_000;
    const KILL_AFTER = 1_000;
    await new Promise<void>((resolve) => {
      for (let i = 0; i < TOTAL; i += 1) {
        const m = stream.next(10);
        device.publish(m.topic, m.payload, { qos: 1 }, (err) => {
          if (err) return;
          ackedMessages += 1;
          for (const r of m.readings) ackedKeys.add(`${r.probeId}:${r.seq}`);
          if (ackedMessages === KILL_AFTER) {
            rig.broker!.proc.kill('SIGKILL');
            resolve();
          }
        });
      }
    });
    await rig.broker!.exited;
    await device.endAsync(true);
    await rig.startBroker();
    rig.startWorker({ LOG_LEVEL: 'info' });
    await rig.waitLive();
    // The worker drains its session; waiting for the acknowledged ones (or 20 s) is enough.
    let stored = new Set<string>();
    for (const until = Date.now() + 20_000; Date.now() < until;) {
      const rows = await rig.pool.query(`SELECT probe_id, seq FROM readings WHERE probe_id IN (${idsSql()}) AND seq > ?`, [seq0]);
      stored = new Set(rows.map((r: { probe_id: number; seq: number }) => `${r.probe_id}:${r.seq}`));
      if ([...ackedKeys].every((k) => stored.has(k))) break;
      await sleep(250);
    }
    const lost = [...ackedKeys].filter((k) => !stored.has(k)).length;
    console.log(`PUBACK window, store before ack ${storeBeforeAck}: ${ackedKeys.size} readings PUBACKed before kill -9, ${lost} of them lost `
      + `(${((100 * lost) / Math.max(1, ackedKeys.size)).toFixed(1)} %); ${stored.size} stored in all (unacknowledged ones that made it count too)`);
    return { acked: ackedKeys.size, lost };
  };

  it('when the broker is killed in the same tick as a PUBACK, then every reading acknowledged before the kill is stored (the broker stores before it acknowledges)', async () => {
    const w = await ackWindow('on', 1_000_000);
    expect(w.acked).toBeGreaterThanOrEqual(10_000);
    expect(w.lost).toBe(0);
  }, 90_000);

  it('when the broker acknowledges in aedes\'s own order (MQTT_STORE_BEFORE_ACK=off) and is killed the same way, then the window that setting leaves open is measured', async () => {
    // Printed, not asserted above zero: whether the kill lands inside the window is a matter of timing.
    const w = await ackWindow('off', 2_000_000);
    expect(w.acked).toBeGreaterThanOrEqual(10_000);
  }, 90_000);

  it('when a device publishes with QoS 2 and the broker is killed between PUBRECs and PUBRELs and again after every PUBCOMP, then every reading is stored exactly once', async () => {
    // The worker is stopped: until the end the readings live only in the broker's on-disk session.
    await kill9(rig.worker!);
    const device = await rig.device('relia-dev-qos2', { clean: false, reconnectPeriod: 300 });
    const stream = rig.stream(3_000_000);
    const TOTAL = 400;
    const KILL_AT_PUBREC = 200;
    const inFlight = new Map<number, string[]>();
    const recorded = new Set<string>();
    let pubrecs = 0;
    device.on('packetsend', (p) => {
      if (p.cmd === 'publish' && p.qos === 2 && p.messageId !== undefined && !inFlight.has(p.messageId)) {
        const body = JSON.parse(String(p.payload)) as { readings: { probe: string; seq: number }[] };
        inFlight.set(p.messageId, body.readings.map((r) => `${rig.probes.find((x) => x.tag === r.probe)!.id}:${r.seq}`));
      }
    });
    device.on('packetreceive', (p) => {
      if (p.cmd !== 'pubrec') return;
      for (const k of inFlight.get(p.messageId!) ?? []) recorded.add(k);
      pubrecs += 1;
      // Same tick as a PUBREC: this message waits for its PUBREL, others are anywhere in their four packets.
      if (pubrecs === KILL_AT_PUBREC) rig.broker!.proc.kill('SIGKILL');
    });
    const completed: Promise<unknown>[] = [];
    for (let i = 0; i < TOTAL; i += 1) {
      const m = stream.next(5);
      completed.push(device.publishAsync(m.topic, m.payload, { qos: 2 }));
    }
    await rig.broker!.exited;
    const recordedAtKill = recorded.size;
    await rig.startBroker();
    // mqtt.js re-sends its PUBRELs and the PUBLISHes not yet received after reconnecting (clean: false).
    await Promise.all(completed);
    await kill9(rig.broker!);
    await device.endAsync(true);
    await rig.startBroker();
    rig.startWorker({ LOG_LEVEL: 'info' });
    await rig.waitLive();
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 30_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    console.log(`${formatComparison('QoS 2, broker kill -9 at the 200th PUBREC and after the last PUBCOMP', c)}; ${recordedAtKill} readings had their PUBREC before the first kill`);
    expect(recordedAtKill).toBeGreaterThan(0);
    expect(drained.reached).toBe(true);
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
  }, 90_000);
});
