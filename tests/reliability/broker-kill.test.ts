/**
 * The broker (ingest/broker.ts, level persistence) kill -9'd and
 * restarted → sessions survive, 0 loss of PUBACKed readings, resume ≤ 5 s.
 *
 * What this settles: aedes 1.2.0 does NOT persist before PUBACK. For QoS 1,
 * lib/handlers/publish.js writes the PUBACK first and only then runs broker.publish(), whose
 * enqueueOffline step puts the message into the level store for persistent subscribers. A kill
 * between the two loses a message the device was told is safe. The second test measures that
 * window; the first proves the device-side rule that closes it: keep the last few seconds of
 * readings and re-send them after any reconnect (the store ignores exact duplicates).
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

  it('when the broker is killed right after PUBACKs, then the acknowledged-but-unpersisted window is measured (device must not rely on PUBACK alone)', async () => {
    // The worker is stopped: messages can only survive in the level store, not in MariaDB.
    await kill9(rig.worker!);
    const device = await rig.device('relia-dev-window', { clean: false, reconnectPeriod: 0 });
    const SEQ0 = 1_000_000;
    const stream = rig.stream(SEQ0);
    const acked: { readings: number }[] = [];
    const ackedKeys = new Set<string>();
    const TOTAL = 2_000;
    const KILL_AFTER = 1_000;
    await new Promise<void>((resolve) => {
      for (let i = 0; i < TOTAL; i += 1) {
        const m = stream.next(10);
        device.publish(m.topic, m.payload, { qos: 1 }, (err) => {
          if (err) return;
          acked.push({ readings: m.readings.length });
          for (const r of m.readings) ackedKeys.add(`${r.probeId}:${r.seq}`);
          // Same tick as the PUBACK arrives: as close to "device told it is safe" as a test gets.
          if (acked.length === KILL_AFTER) {
            rig.broker!.proc.kill('SIGKILL');
            resolve();
          }
        });
      }
    });
    await rig.broker!.exited;
    await device.endAsync(true);
    const ackedReadings = ackedKeys.size;
    await rig.startBroker();
    rig.startWorker({ LOG_LEVEL: 'info' });
    await rig.waitLive();
    await sleep(3_000);
    const rows = await rig.pool.query(`SELECT probe_id, seq FROM readings WHERE probe_id IN (${idsSql()}) AND seq > ?`, [SEQ0]);
    const stored = new Set(rows.map((r: { probe_id: number; seq: number }) => `${r.probe_id}:${r.seq}`));
    const lostAcked = [...ackedKeys].filter((k) => !stored.has(k)).length;
    console.log(`window: ${ackedReadings} readings PUBACKed before kill -9, ${lostAcked} of them not persisted by the broker `
      + `(${((100 * lostAcked) / Math.max(1, ackedReadings)).toFixed(1)} %); ${stored.size} stored in all (unacked ones that made it count too)`);
    // Not asserted to be 0: aedes acks before persisting. The figure is for the closing note.
    expect(ackedReadings).toBeGreaterThan(0);
  }, 90_000);
});
