/**
 * npm run bench:scale — the capacity table of README "Scaling out", measured on this machine:
 *   ingest: readings/s stored with 1 and 2 ingest workers (site slices), per-reading messages
 *           and 100-reading batches, published as fast as the broker acknowledges;
 *   API:    alarm latency (device publish → `alarm:event` on every dashboard) with 1 and 2 API
 *           nodes, for growing numbers of concurrent dashboard clients (websocket).
 * Everything is on one box: the publishers and the dashboards compete with the cluster for
 * the same cores, so figures are a floor for a site with separate machines.
 * Settings: SCALE_BENCH_READINGS=60000, SCALE_BENCH_CLIENTS=100,500,1500.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createIngestPool } from '../api/src/db/pool.ts';
import { startCluster } from '../tests/scale/lib/cluster.ts';
import { addAlarmTanks, sitesOnSlices } from '../tests/scale/lib/plant.ts';
import { closeWatchers, connectWatchers, watcherToken } from '../tests/scale/lib/watchers.ts';
import { alarmLatency, benchServer, ingestRate, type Latency } from './lib/scale-phases.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const READINGS = Number(process.env.SCALE_BENCH_READINGS ?? 60_000);
const CLIENTS = (process.env.SCALE_BENCH_CLIENTS ?? '100,500,1500').split(',').map(Number);
const ALARMS_PER_ROUND = 10;
const out = (s: string) => process.stdout.write(s + '\n');
const fmt = (n: number) => Math.round(n).toLocaleString('en');
process.env.RELIABILITY_LOG_LEVEL ??= 'error';

const server = await benchServer(ROOT);
const rows: string[] = [];
try {
  // ---- ingest: 1 and 2 workers ---------------------------------------------------------------
  for (const workers of [1, 2]) {
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
  for (const apiNodes of [1, 2]) {
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
} finally {
  await server.stop();
}
out('\n| configuration | measured |\n|---|---|');
for (const r of rows) out(r);
process.exit(0);
