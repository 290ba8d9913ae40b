/**
 * npm run bench:ack — what storing a device's QoS 1 message before its PUBACK costs
 * (ingest/broker/store-before-ack.ts): the broker's QoS 1 pass-through to a clean: false
 * subscriber (the ingest worker's kind of session), with the store first (on, the default) and
 * with aedes's own order (MQTT_STORE_BEFORE_ACK=off), alternating in one run, BENCH_RUNS times
 * each (default 3).
 * Shapes: single-reading messages from 200 connections (BENCH_HZ readings/s per probe offered,
 * default 10, i.e. 2,000 msg/s: about what this pass-through carries on 2 cores; far above it the
 * backlog, not the store, sets how long a run takes), and 100-reading batches (100,000 readings/s offered).
 * Settings: BENCH_SECONDS (default 10) per measurement.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createIngestPool } from '../api/src/db/pool.ts';
import { findFreePort } from '../scripts/lib/ports.ts';
import { ensureLoadProbes } from '../simulators/plant/load-probes.ts';
import { kill9, killAll, startBrokerProcess } from '../tests/reliability/lib/procs.ts';
import { startBenchDb } from './lib/bench-db.ts';
import { ensureBenchSite, passThrough } from './lib/ingest-phases.ts';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const RUNS = Number(process.env.BENCH_RUNS ?? 3);
/** Readings a second per probe offered in the single-reading shape (200 probes). */
const HZ = Number(process.env.BENCH_HZ ?? 10);
const out = (s: string) => process.stdout.write(s + '\n');
const k = (n: number) => Math.round(n).toLocaleString('en');
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;

const db = await startBenchDb();
const pool = createIngestPool(db.databaseUrl, 2);
const dirs: string[] = [];
const figures: Record<'on' | 'off', { single: number[]; batch: number[] }> = { on: { single: [], batch: [] }, off: { single: [], batch: [] } };
try {
  const device = await ensureBenchSite(pool, 'bench', 200);
  await ensureLoadProbes(db.databaseUrl, 'bench', 200);
  out(`bench site ready; ${RUNS} runs × 2 modes × 2 shapes, ${SECONDS} s each`);
  let seq = 1_000_000;
  for (let run = 0; run < RUNS; run += 1) {
    for (const mode of ['on', 'off'] as const) {
      const port = await findFreePort();
      const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-bench-ack-'));
      dirs.push(dataDir);
      const broker = await startBrokerProcess({ port, dataDir, databaseUrl: db.databaseUrl, extra: { MQTT_STORE_BEFORE_ACK: mode } });
      out(`run ${run + 1} store-before-ack ${mode}: broker up`);
      // A crash (not the kill at the end) is shown with the broker's last lines.
      void broker.exited.then((code) => { if (code) out(`broker exited (${code}): ${broker.lines.slice(-25).join(' | ')}`); });
      const load = { mqttUrl: `mqtt://127.0.0.1:${port}`, username: device.username, password: device.password, siteTag: 'bench' };
      figures[mode].single.push(await passThrough(load, port, { tanks: 200, hz: HZ, batch: 1, connections: 200, durationS: SECONDS, seqStart: (seq += 100_000) }, true));
      figures[mode].batch.push(await passThrough(load, port, { tanks: 100, hz: 1000, batch: 100, durationS: SECONDS, seqStart: (seq += 100_000) }, true));
      await kill9(broker);
      out(`run ${run + 1} store-before-ack ${mode}: single ${k(figures[mode].single.at(-1)!)} msg/s, 100-reading batches ${k(figures[mode].batch.at(-1)!)} readings/s`);
    }
  }
  const cost = (shape: 'single' | 'batch') => `${k(median(figures.on[shape]))} vs ${k(median(figures.off[shape]))} (${(100 * (median(figures.on[shape]) / median(figures.off[shape]) - 1)).toFixed(0)} %)`;
  out(`median of ${RUNS}: single-reading messages ${cost('single')} msg/s; 100-reading batches ${cost('batch')} readings/s (store first vs aedes's order)`);
} finally {
  await killAll();
  await pool.end();
  await db.stop();
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
}
