/**
 * npm run bench:scale — the capacity table of README "Scaling out", measured on this machine:
 *   ingest: readings/s stored with 1 and 2 ingest workers (site slices), per-reading messages
 *           and 100-reading batches, published as fast as the broker acknowledges;
 *   API:    alarm latency (device publish → `alarm:event` on every dashboard) with 1 and 2 API
 *           nodes, for growing numbers of concurrent dashboard clients (websocket).
 * Everything is on one box: the publishers and the dashboards compete with the cluster for
 * the same cores, so figures are a floor for a site with separate machines.
 *   brokers: the same 2 workers behind the embedded broker (site slices) and behind Debian's
 *           mosquitto 2 (one shared subscription), side by side: readings/s stored, publish →
 *           commit p99 at 1,000 readings/s, and each as a share of the ceilings measured in the
 *           same run (the bare broker with a do-nothing subscriber; MariaDB's durable inserts).
 * Settings: SCALE_BENCH_READINGS=60000, SCALE_BENCH_CLIENTS=100,500,1500,
 *   SCALE_BENCH_PHASES=ingest,api,brokers (which parts to run). mosquitto: FERRISIGHT_MOSQUITTO=1 bash scripts/ensure-deps.sh test.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createIngestPool } from '../api/src/db/pool.ts';
import { startCluster } from '../tests/scale/lib/cluster.ts';
import { addAlarmTanks, DEVICE_PASSWORD, sitesOnSlices } from '../tests/scale/lib/plant.ts';
import { SERVICE_PASSWORD } from '../tests/reliability/lib/procs.ts';
import { insertCeiling, passThrough } from './lib/ingest-phases.ts';
import { closeWatchers, connectWatchers, watcherToken } from '../tests/scale/lib/watchers.ts';
import { alarmLatency, benchServer, commitLatency, ingestRate, type Latency } from './lib/scale-phases.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const READINGS = Number(process.env.SCALE_BENCH_READINGS ?? 60_000);
const CLIENTS = (process.env.SCALE_BENCH_CLIENTS ?? '100,500,1500').split(',').map(Number);
const ALARMS_PER_ROUND = 10;
const PHASES = new Set((process.env.SCALE_BENCH_PHASES ?? 'ingest,api,brokers').split(','));
const pct = (a: number, b: number) => `${Math.round((a / b) * 100)} %`;
const out = (s: string) => process.stdout.write(s + '\n');
const fmt = (n: number) => Math.round(n).toLocaleString('en');
process.env.RELIABILITY_LOG_LEVEL ??= 'error';

const server = await benchServer(ROOT);
const rows: string[] = [];
try {
  // ---- ingest: 1 and 2 workers ---------------------------------------------------------------
  for (const workers of PHASES.has('ingest') ? [1, 2] : []) {
    const url = await server.newDatabase(`scale_ingest_${workers}`);
    const pool = createIngestPool(url, 3);
    const sites = await sitesOnSlices(pool, 2, 50);
    const cluster = await startCluster({ databaseUrl: url, apiNodes: 0, workers, sliceBy: 'site' });
    try {
      for (const s of sites) await s.waitLive(cluster.mqttPort);
      // Per probe: READINGS / 100 s of data one per message, then 5× that in batches, both in the past hours.
      const hour = 3_600_000;
      const single = await ingestRate(pool, cluster.mqttPort, sites, READINGS, 1, 100_000, Date.now() - 12 * hour);
      const batched = await ingestRate(pool, cluster.mqttPort, sites, READINGS * 5, 100, 200_000, Date.now() - 10 * hour);
      out(`ingest, ${workers} worker(s): ${fmt(single)} readings/s one per message, ${fmt(batched)} readings/s in batches of 100`);
      rows.push(`| ${workers} ingest worker${workers > 1 ? 's' : ''} | ${fmt(single)} readings/s (1 per message) · ${fmt(batched)} readings/s (batches of 100) |`);
    } finally {
      await cluster.close();
      await pool.end();
    }
  }

  // ---- API nodes: alarm latency with growing dashboards ---------------------------------------
  for (const apiNodes of PHASES.has('api') ? [1, 2] : []) {
    const url = await server.newDatabase(`scale_api_${apiNodes}`);
    const pool = createIngestPool(url, 3);
    const sites = await sitesOnSlices(pool, 2, 5);
    const tanks = await addAlarmTanks(pool, url, sites, (CLIENTS.length * ALARMS_PER_ROUND) / 2);
    const cluster = await startCluster({ databaseUrl: url, apiNodes, workers: 2, sliceBy: 'site' });
    const token = await watcherToken(pool);
    try {
      for (const s of sites) await s.waitLive(cluster.mqttPort);
      const cells: string[] = [];
      for (const [round, clients] of CLIENTS.entries()) {
        const watchers = [];
        // Connected in groups, as dashboards come and go, rather than all in one instant.
        for (let c = 0; c < clients; c += 100) watchers.push(...(await connectWatchers(cluster.apiPorts, Math.ceil(Math.min(100, clients - c) / apiNodes), token)));
        await new Promise((r) => setTimeout(r, 1500));
        const round_ = tanks.filter((_, i) => i % CLIENTS.length === round);
        const l: Latency = await alarmLatency(pool, cluster.mqttPort, round_, watchers);
        closeWatchers(watchers);
        out(`api, ${apiNodes} node(s), ${watchers.length} clients: p50 ${fmt(l.p50)} ms, p95 ${fmt(l.p95)} ms, max ${fmt(l.max)} ms, delivered ${(l.delivered * 100).toFixed(1)} %`);
        cells.push(`${watchers.length} clients: p50 ${fmt(l.p50)} ms / p95 ${fmt(l.p95)} ms${l.delivered < 1 ? ` (${(l.delivered * 100).toFixed(1)} % delivered)` : ''}`);
        await new Promise((r) => setTimeout(r, 1000));
      }
      rows.push(`| ${apiNodes} API node${apiNodes > 1 ? 's' : ''} | ${cells.join(' · ')} |`);
    } finally {
      await cluster.close();
      await pool.end();
    }
  }

  // ---- the same two workers behind the embedded broker and behind mosquitto 2 ------------------
  for (const broker of PHASES.has('brokers') ? (['embedded', 'mosquitto'] as const) : []) {
    const url = await server.newDatabase(`scale_broker_${broker}`);
    const pool = createIngestPool(url, 3);
    const sites = await sitesOnSlices(pool, 2, 50);
    const cluster = await startCluster({
      databaseUrl: url, apiNodes: 0, workers: 2, sliceBy: 'site', broker, startWorkers: false,
      devices: sites.map((s) => ({ username: s.device, password: DEVICE_PASSWORD, siteTag: s.tag })),
    });
    try {
      // Ceilings of this run, before the workers start: the bare broker (persistent QoS 1 subscriber, as the worker has)
      // and MariaDB's durable 1,000-row inserts. Offered at 10,000 msg/s and 400,000 readings/s, above what either broker passes here.
      const load = { mqttUrl: `mqtt://127.0.0.1:${cluster.mqttPort}`, username: sites[0]!.device, password: DEVICE_PASSWORD, siteTag: sites[0]!.tag };
      const ptSingle = await passThrough(load, cluster.mqttPort, { tanks: 200, hz: 50, batch: 1, connections: 20, durationS: 10, seqStart: 7_000_000 }, true);
      const ptBatch = await passThrough(load, cluster.mqttPort, { tanks: 100, hz: 4000, batch: 100, durationS: 10, seqStart: 8_000_000 }, true);
      const insert = await insertCeiling(pool, 100_000);
      cluster.startWorker(0);
      cluster.startWorker(1);
      for (const s of sites) await s.waitLive(cluster.mqttPort);
      const hour = 3_600_000;
      const single = await ingestRate(pool, cluster.mqttPort, sites, READINGS, 1, 100_000, Date.now() - 12 * hour);
      const batched = await ingestRate(pool, cluster.mqttPort, sites, READINGS * 5, 100, 200_000, Date.now() - 10 * hour);
      const lat = await commitLatency(cluster.mqttPort, sites[0]!, { username: 'ferrisight-service', password: SERVICE_PASSWORD },
        { readingsPerS: 1000, batch: 10, seconds: 20, seqBase: 9_000_000 });
      const label = broker === 'embedded' ? 'embedded broker (aedes), 2 workers on site slices' : 'mosquitto 2, 2 workers on one shared subscription';
      out(`${label}: ${fmt(single)} readings/s one per message (${pct(single, ptSingle)} of the bare broker's ${fmt(ptSingle)} msg/s), `
        + `${fmt(batched)} readings/s in batches of 100 (${pct(batched, Math.min(ptBatch, insert))} of min(bare broker ${fmt(ptBatch)}, inserts ${fmt(insert)}) readings/s), `
        + `publish → commit p50 ${fmt(lat.p50)} ms, p99 ${fmt(lat.p99)} ms at 1,000 readings/s (${lat.n} samples)`);
      rows.push(`| ${label} | ${fmt(single)} readings/s (1 per message, ${pct(single, ptSingle)} of bare broker) · ${fmt(batched)} readings/s (batches of 100, `
        + `${pct(batched, Math.min(ptBatch, insert))} of ceiling) · publish → commit p99 ${fmt(lat.p99)} ms at 1,000 readings/s |`);
    } finally {
      await cluster.close();
      await pool.end();
    }
  }
} finally {
  await server.stop();
}
out('\n| configuration | measured |\n|---|---|');
for (const r of rows) out(r);
process.exit(0);
