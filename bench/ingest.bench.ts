/**
 * npm run bench:ingest — ingest throughput and latency: the simulator's load mode (simulators/plant/load.ts)
 * through the real broker, ingest worker (child processes) and a private MariaDB, with the
 * machine's ceilings measured in the same run and printed side by side:
 *   (a) readings/s, 1,000-reading batch messages   vs  MariaDB multi-row INSERT of the same rows
 *   (b) readings/s, single-reading messages from 200 connections  vs  broker QoS 1 pass-through
 *   (c) at 2,000 readings/s: p50/p99 publish→commit and commit→socket.io client (API process)
 * Settings: BENCH_SECONDS (default 10) per throughput phase.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createIngestPool } from '../api/src/db/pool.ts';
import { findFreePort } from '../scripts/lib/ports.ts';
import { runLoad } from '../simulators/plant/load.ts';
import { ensureLoadProbes } from '../simulators/plant/load-probes.ts';
import { kill9, killAll, rssMiB, startBrokerProcess, startWorkerProcess, type Child } from '../tests/reliability/lib/procs.ts';
import { startBenchDb } from './lib/bench-db.ts';
import { ensureBenchSite, insertCeiling, measureLatency, passThrough, storedRate } from './lib/ingest-phases.ts';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 10);
const out = (s: string) => process.stdout.write(s + '\n');
const pct = (a: number, b: number) => `${((100 * a) / b).toFixed(0)} %`;
const k = (n: number) => Math.round(n).toLocaleString('en');

const db = await startBenchDb();
const pool = createIngestPool(db.databaseUrl, 2);
const dirs: string[] = [];
const peak: Record<string, number> = {};
const track = (name: string, c: Child) => {
  const t = setInterval(() => { peak[name] = Math.max(peak[name] ?? 0, rssMiB(c.pid)?.peak || 0); }, 500);
  t.unref();
};
try {
  const device = await ensureBenchSite(pool, 'bench', 200);
  await ensureLoadProbes(db.databaseUrl, 'bench', 200);
  const port = await findFreePort();
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-bench-')); dirs.push(dataDir);
  const broker = await startBrokerProcess({ port, dataDir, databaseUrl: db.databaseUrl });
  const worker = startWorkerProcess({ mqttPort: port, databaseUrl: db.databaseUrl, clientId: 'ferrisight-ingest-bench' });
  track('broker', broker); track('worker', worker);
  const load = { mqttUrl: `mqtt://127.0.0.1:${port}`, username: device.username, password: device.password, siteTag: 'bench' };
  // Warm-up: the worker's session and probe cache exist before anything is timed (early sends may predate its subscription).
  for (let i = 0; (await storedRate(pool, 0, 0, 0, 0)).count === 0; i += 1) {
    if (i > 30) throw new Error('the worker stored nothing in 30 s');
    await runLoad({ ...load, tanks: 10, hz: 10, batch: 10, durationS: 1, seqStart: 1 + i * 100 });
  }

  out(`ingest benchmark: ${SECONDS} s per phase, ${os.cpus().length} cores, ${os.cpus()[0]?.model ?? '?'}`);
  // (a) 1,000-reading batches (100 probes × 10 timestamps each), offered at 100,000 readings/s (as
  // the pass-through ceiling below), faster than it can go: the rate is readings committed / time until the last one is committed.
  let before = await storedRate(pool, 0, 0, 0, 0);
  let t0 = Date.now();
  const a = await runLoad({ ...load, tanks: 100, hz: 1000, batch: 1000, durationS: SECONDS, seqStart: 1_000_000 });
  const aRate = (await storedRate(pool, before.count, t0, a.sentReadings, 300_000)).rate;
  // (b) single readings from 200 device connections.
  before = await storedRate(pool, 0, 0, 0, 0);
  t0 = Date.now();
  // Offered at 8,000 msg/s, at least the broker's pass-through, so the pipeline sets the pace.
  const b = await runLoad({ ...load, tanks: 200, hz: 40, batch: 1, connections: 200, durationS: SECONDS, seqStart: 2_000_000 });
  const bRate = (await storedRate(pool, before.count, t0, b.sentReadings, 300_000)).rate;
  // (c) latency at the soak test's shape (200 msg/s × 10 readings), with the API pushing to a socket.io client.
  const lat = await measureLatency({ pool, databaseUrl: db.databaseUrl, mqttPort: port, load, seconds: Math.max(10, SECONDS * 2), track });

  // Ceilings, same run, same machine.
  const insert = await insertCeiling(pool, 200_000);
  await kill9(worker);
  const ptPort = await findFreePort();
  const ptDir = mkdtempSync(path.join(os.tmpdir(), 'fs-bench-pt-')); dirs.push(ptDir);
  const ptBroker = await startBrokerProcess({ port: ptPort, dataDir: ptDir, databaseUrl: db.databaseUrl });
  const ptLoad = { ...load, mqttUrl: `mqtt://127.0.0.1:${ptPort}` };
  // Offered as fast as the generator goes: these are ceilings, not the pipeline's load.
  // The subscriber keeps the worker's kind of session (clean: false); a clean session's figure is printed beside it.
  const ptBatch = await passThrough(ptLoad, ptPort, { tanks: 100, hz: 1000, batch: 1000, durationS: SECONDS / 2, seqStart: 3_000_000 }, true);
  const ptSingle = await passThrough(ptLoad, ptPort, { tanks: 200, hz: 200, batch: 1, connections: 200, durationS: SECONDS / 2, seqStart: 4_000_000 }, true);
  const ptSingleClean = await passThrough(ptLoad, ptPort, { tanks: 200, hz: 200, batch: 1, connections: 200, durationS: SECONDS / 2, seqStart: 5_000_000 }, false);
  await kill9(ptBroker);

  out(`(a) 1,000-reading batches:        ${k(aRate)} readings/s committed   | MariaDB multi-row INSERT ceiling ${k(insert)} rows/s → ${pct(aRate, insert)} (target ≥ 50 %)`);
  out(`    broker pass-through of 1,000-reading batches: ${k(ptBatch)} readings/s → pipeline at ${pct(aRate, ptBatch)} of it`);
  out(`(b) single readings, 200 connections: ${k(bRate)} readings/s committed | broker QoS 1 pass-through ceiling ${k(ptSingle)} msg/s to a clean: false subscriber → ${pct(bRate, ptSingle)} (target ≥ 50 %)`);
  out(`    the same pass-through to a clean-session subscriber (in-flight messages not stored): ${k(ptSingleClean)} msg/s → pipeline at ${pct(bRate, ptSingleClean)} of it`);
  out(`(c) at 2,000 readings/s: publish→commit p50 ${lat.commit.p50.toFixed(0)} ms p99 ${lat.commit.p99.toFixed(0)} ms; `
    + `commit→socket.io p50 ${lat.socket.p50.toFixed(0)} ms p99 ${lat.socket.p99.toFixed(0)} ms; publish→socket.io p99 ${lat.total.p99.toFixed(0)} ms (target < 1,000 ms)`);
  out(`peak RSS: ${Object.entries(peak).map(([n, v]) => `${n} ${v.toFixed(0)} MiB`).join(', ')}, bench ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB`);
  out(`RESULT ${JSON.stringify({
    bench: 'ingest', seconds: SECONDS, batchReadingsPerS: aRate, insertCeilingRowsPerS: insert, singleReadingsPerS: bRate, passThroughBatchReadingsPerS: ptBatch,
    passThroughSingleMsgPerS: ptSingle, passThroughSingleCleanSessionMsgPerS: ptSingleClean, ratioA: aRate / insert, ratioB: bRate / ptSingle, latency: lat, peakRssMiB: peak,
  })}`);
} finally {
  await killAll();
  await pool.end();
  await db.stop();
  for (const d of dirs) rmSync(d, { recursive: true, force: true });
}
