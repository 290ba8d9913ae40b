/**
 * The ingest worker SIGKILLed repeatedly under a 2,000 readings/s stream
 * (200 msg/s × 10, the soak's shape) → 0 lost, 0 duplicated, backlog drained within 30 s.
 * Short form: 3 kills over ~20 s. FERRISIGHT_LONG=1 (or npm run soak): 10 kills over ~2 min.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, rollupMismatches, waitForCount } from './lib/compare.ts';
import { kill9 } from './lib/procs.ts';
import { drive, startLiveRig, stopLiveRig, type Rig } from './lib/rig.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const KILLS = LONG ? 10 : 3;
const DURATION_MS = LONG ? 120_000 : 20_000;
const RATE = 2_000;

let db: TestDatabase;
let rig: Rig;

beforeAll(async () => {
  ({ db, rig } = await startLiveRig(20));
});
afterAll(() => stopLiveRig({ db, rig }));

async function storedCount(): Promise<number> {
  const ids = rig.probes.map((p) => p.id);
  const [{ n }] = await rig.pool.query(`SELECT COUNT(*) AS n FROM readings WHERE probe_id IN (${ids.join(',')})`);
  return Number(n);
}

describe('ingest worker SIGKILL under load', () => {
  it(`when the worker is SIGKILLed ${KILLS} times during a ${RATE} readings/s stream, then nothing is lost or duplicated and the backlog drains within 30 s`, async () => {
    const device = await rig.device('relia-dev-kill', { clean: false });
    const stream = rig.stream();
    const killAt = Array.from({ length: KILLS }, (_, i) => ((i + 0.5) * DURATION_MS) / KILLS);
    const catchUps: Promise<number>[] = [];
    let kills = 0;

    const run = await drive(device, stream, {
      readingsPerS: RATE, batch: 10, durationMs: DURATION_MS,
      during: async (elapsed) => {
        if (kills >= KILLS || elapsed < killAt[kills]) return;
        kills += 1;
        await kill9(rig.worker!);
        // Restarted at once, as the supervisor would (it waits 1 s); catch-up = restart → stored ≥ what the broker held at the kill.
        const target = stream.acked.count;
        const restartedAt = Date.now();
        rig.startWorker();
        catchUps.push((async () => {
          while ((await storedCount()) < target) await new Promise((r) => setTimeout(r, 100));
          return Date.now() - restartedAt;
        })());
      },
    });
    await run.acked;
    const endedAt = Date.now();
    const drained = await waitForCount(rig.pool, stream.sent.snapshot(), 60_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    const catchUpMs = await Promise.all(catchUps);
    console.log(formatComparison(`worker SIGKILL ×${kills}`, c));
    console.log(`sent ${run.readings} readings in ${(run.elapsedMs / 1000).toFixed(1)} s (${Math.round(run.readings / (run.elapsedMs / 1000))}/s); `
      + `catch-up after each restart: ${catchUpMs.map((ms) => `${(ms / 1000).toFixed(1)} s`).join(', ')}; drained ${((Date.now() - endedAt) / 1000).toFixed(1)} s after the last PUBACK`);

    expect(kills).toBe(KILLS);
    expect(drained.reached).toBe(true);
    expect(c).toMatchObject({ lost: 0, duplicated: 0, unexpected: 0, conflicts: 0, ok: true });
    expect(Math.max(...catchUpMs)).toBeLessThanOrEqual(30_000);
    // After crashes and redeliveries, the 1 m and 1 h rollups still equal the raw aggregate.
    const rollups = await rollupMismatches(rig.pool, rig.probes.map((p) => p.id));
    console.log(`rollup buckets differing from raw after the kills: ${JSON.stringify(rollups)}`);
    expect(rollups).toEqual({ minute: 0, hour: 0 });
  }, DURATION_MS + 120_000);
});
