/**
 * mariadbd kill -9 mid-stream, down for a while, restarted → 0 lost,
 * 0 duplicated, the worker survives (same pid) and catches up; broker RSS growth ≤ 150 MB.
 * Short form: 10 s outage in a ~30 s stream. FERRISIGHT_LONG=1 / npm run soak: 30 s outage.
 * Runs on a MariaDB of its own (lib/private-db.ts): the shared test server serves other files.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareStored, deadLetterSummary, formatComparison, waitForCount } from './lib/compare.ts';
import { startPrivateDb, type PrivateDb } from './lib/private-db.ts';
import { killAll, rssMiB } from './lib/procs.ts';
import { createRig, drive, type Rig } from './lib/rig.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const OUTAGE_MS = LONG ? 30_000 : 10_000;
const KILL_AT_MS = 5_000;
const DURATION_MS = KILL_AT_MS + OUTAGE_MS + 10_000;

let db: PrivateDb;
let rig: Rig;

beforeAll(async () => {
  db = await startPrivateDb('kill');
  rig = await createRig({ databaseUrl: db.databaseUrl, probes: 20 });
  await rig.startBroker();
  rig.startWorker();
  await rig.waitLive();
}, 120_000);

afterAll(async () => {
  await killAll();
  await rig?.close();
  await db?.stop();
});

describe('MariaDB kill -9 under load', () => {
  it(`when mariadbd is killed for ${OUTAGE_MS / 1000} s mid-stream, then nothing is lost or duplicated and the worker survives`, async () => {
    const device = await rig.device('relia-dev-dbkill', { clean: false });
    const stream = rig.stream();
    const worker = rig.worker!;
    const brokerPid = rig.broker!.pid;
    const rssBefore = rssMiB(brokerPid)!.rss;
    let rssPeak = rssBefore;
    let phase: 'up' | 'down' | 'restarting' | 'back' = 'up';
    let restart: Promise<void> | undefined;
    let restartedAt = 0;

    const run = await drive(device, stream, {
      readingsPerS: 2_000, batch: 10, durationMs: DURATION_MS,
      during: async (elapsed) => {
        rssPeak = Math.max(rssPeak, rssMiB(brokerPid)?.rss ?? 0);
        if (phase === 'up' && elapsed >= KILL_AT_MS) {
          phase = 'down';
          await db.kill();
        } else if (phase === 'down' && elapsed >= KILL_AT_MS + OUTAGE_MS) {
          phase = 'restarting';
          // Not awaited: the device keeps publishing while InnoDB recovers.
          restart = db.start().then(() => { phase = 'back'; restartedAt = Date.now(); });
        }
      },
    });
    await restart;
    await run.acked;
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 90_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    const catchUpS = (Date.now() - restartedAt) / 1000;
    console.log(formatComparison(`mariadbd kill -9, ${OUTAGE_MS / 1000} s outage`, c), await deadLetterSummary(rig.pool));
    console.log(`worker pid ${worker.pid} ${worker.proc.exitCode === null && worker.proc.signalCode === null ? 'still running' : 'EXITED'}; `
      + `caught up ${catchUpS.toFixed(1)} s after MariaDB answered again; broker RSS ${rssBefore.toFixed(0)} → peak ${rssPeak.toFixed(0)} MiB (+${(rssPeak - rssBefore).toFixed(0)})`);

    expect(worker.proc.exitCode).toBeNull();
    expect(worker.proc.signalCode).toBeNull();
    expect(drained.reached).toBe(true);
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
    expect(rssPeak - rssBefore).toBeLessThanOrEqual(150);
  }, DURATION_MS + 150_000);
});
