/**
 * Ferrisight behind a site's own broker (README "Scaling out"): Debian's mosquitto 2 on
 * loopback with its own config, password file and ACL; two ingest workers share the device
 * topics through one shared subscription ($share/<group>/…, MQTT 5 §4.8.2, which mosquitto
 * also offers to 3.1.1 clients); one worker is SIGKILLed halfway through a 60 s stream at
 * 1,000 readings/s and restarted as the supervisor would. Nothing may be lost or stored twice
 * and the order-independent checksums of sent and stored rows must be equal.
 * Runs in CI (CI=true) and with FERRISIGHT_SCALE=1 (see vite.config.ts); needs mosquitto
 * (scripts/ensure-deps.sh test installs it then).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMosquitto, type RunningMosquitto } from '../../scripts/lib/mosquitto.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, waitForCount } from '../reliability/lib/compare.ts';
import { kill9, killAll, SERVICE_PASSWORD, sleep, startWorkerProcess, type Child } from '../reliability/lib/procs.ts';
import { createRig, DEVICE_PASSWORD, drive, type Rig } from '../reliability/lib/rig.ts';

const DURATION_MS = 60_000;
const RATE = 1_000;
const GROUP = 'ferrisight-ingest';

let db: TestDatabase;
let rig: Rig;
let broker: RunningMosquitto;
const workers: Child[] = [];

function startWorker(i: number): Child {
  const child = startWorkerProcess({
    mqttPort: rig.mqttPort, databaseUrl: db.databaseUrl, clientId: 'ferrisight-ingest-mosq',
    extra: { INGEST_SLICE: `${i + 1}/2`, INGEST_SHARED_GROUP: GROUP, LOG_LEVEL: 'info', FERRISIGHT_PROC: `ingest${i + 1}` },
  });
  workers[i] = child;
  return child;
}

/** readingsStored of a worker's last "ingest health" log line (every 30 s), 0 when none yet. */
function storedBy(lines: string[]): number {
  const health = lines.filter((l) => l.includes('"ingest health"')).at(-1);
  return health ? Number(JSON.parse(health).readingsStored ?? 0) : 0;
}

async function subscribed(child: Child, timeoutMs = 60_000): Promise<void> {
  const until = Date.now() + timeoutMs;
  while (!child.lines.some((l) => l.includes('slice subscriptions in place'))) {
    if (Date.now() > until) throw new Error(`worker not subscribed within ${timeoutMs} ms:\n${child.lines.join('\n')}`);
    await sleep(100);
  }
}

beforeAll(async () => {
  db = await createTestDatabase();
  rig = await createRig({ databaseUrl: db.databaseUrl, probes: 20, siteTag: 'mosq' });
  broker = await startMosquitto(`${rig.dataDir}/mosquitto`, rig.mqttPort, [
    { username: 'ferrisight-service', password: SERVICE_PASSWORD, write: ['#'], read: ['#', '$share/#'] },
    { username: 'relia-device', password: DEVICE_PASSWORD, write: ['ferrisight/v1/mosq/#'], read: [] },
  ]);
  startWorker(0);
  startWorker(1);
  await Promise.all(workers.map((w) => subscribed(w)));
  await rig.waitLive();
}, 180_000);

afterAll(async () => {
  await killAll();
  await broker?.stop();
  await rig?.close();
  await db?.drop();
});

describe('two ingest workers on mosquitto 2 with a shared subscription', () => {
  it('when one of two workers is SIGKILLed halfway through 60 s at 1,000 readings/s, then nothing is lost or duplicated and the checksums are equal', async () => {
    const device = await rig.device('mosq-dev-1', { clean: false });
    const stream = rig.stream();
    let killed = false;
    let killedLines: string[] = [];
    const run = await drive(device, stream, {
      readingsPerS: RATE, batch: 10, durationMs: DURATION_MS,
      during: async (elapsed) => {
        if (killed || elapsed < DURATION_MS / 2) return;
        killed = true;
        killedLines = workers[0]!.lines.slice();
        await kill9(workers[0]!);
        // The supervisor restarts a worker after about a second, under the same client id.
        setTimeout(() => startWorker(0), 1_000);
      },
    });
    await run.acked;
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 60_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    console.log(formatComparison('mosquitto shared subscription, 1 worker SIGKILLed', c));
    console.log(`sent ${run.readings} readings in ${(run.elapsedMs / 1000).toFixed(1)} s (${Math.round(run.readings / (run.elapsedMs / 1000))}/s)`);

    expect(killed).toBe(true);
    expect(run.readings).toBeGreaterThanOrEqual(RATE * (DURATION_MS / 1000) * 0.95);
    expect(drained.reached).toBe(true);
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
    expect(c.checksumStored).toBe(c.checksumSent);
    // The broker balanced: before the kill both members had stored part of the stream (their 30 s health lines).
    const shares = [storedBy(killedLines), storedBy(workers[1]!.lines)];
    console.log(`readings stored by worker 1 before its kill, by worker 2 at its last health line: ${shares.join(', ')}`);
    expect(shares.every((n) => n > 0)).toBe(true);
  }, DURATION_MS + 180_000);
});
