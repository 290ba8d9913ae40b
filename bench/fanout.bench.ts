/**
 * npm run bench:fanout — live push to many screens: a generated plant of 500 tanks in several
 * sites and circuits reporting every second (500 readings/s through the real broker and ingest
 * worker), with N socket.io clients signed in across roles and sites, on one API node and on two
 * behind Redis. Each client watches what a screen shows: most one site's Floor, some every site
 * (the site overview on a wall). Printed side by side: stored → client p50/p99 for each N,
 * tank updates per client per second, API CPU and RSS per 100 clients, the N at which p99 passes
 * 1 s, and the same p99 with paused clients connected (a backgrounded tab must not slow others).
 * Figures go to bench/results/latest.md under "bench:fanout".
 * Settings: FANOUT_CLIENTS=50,200,500  FANOUT_WINDOW_S=15  FANOUT_NODES=1,2  FANOUT_PAUSED=20
 */
import { readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import mqtt from 'mqtt';
import { createIngestPool } from '../api/src/db/pool.ts';
import { latestMessageSchema, latestTopic, parseInternal } from '../shared/schemas/internal-topics.ts';
import { JWT_SECRET, startCluster } from '../tests/scale/lib/cluster.ts';
import { rssMiB, SERVICE_PASSWORD } from '../tests/reliability/lib/procs.ts';
import { quantile } from './lib/bench-db.ts';
import { roleTokens, seedFanoutPlant, startGateways } from './lib/fanout-plant.ts';
import { benchServer } from './lib/scale-phases.ts';
import { connectScreens, pausedScreens, type Screen } from './lib/screens.ts';
import { writeBenchSection } from './lib/results.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const CLIENTS = (process.env.FANOUT_CLIENTS ?? '50,200,500').split(',').map(Number);
const NODES = (process.env.FANOUT_NODES ?? '1,2').split(',').map(Number);
const WINDOW_S = Number(process.env.FANOUT_WINDOW_S ?? 15);
const PAUSED = Number(process.env.FANOUT_PAUSED ?? 20);
const SHAPE = { sites: 5, circuits: 4, tanksPerCircuit: 25 };
const lines: string[] = [];
const out = (s: string) => {
  lines.push(s);
  process.stdout.write(s + '\n');
};
const fmt = (n: number) => (Number.isFinite(n) ? Math.round(n).toLocaleString('en') : 'n/a');
const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
process.env.RELIABILITY_LOG_LEVEL ??= 'error';

/** CPU seconds (user + system) a pid has used so far, from /proc. */
function cpuSeconds(pid: number): number {
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    // Fields 14 and 15 (utime, stime) in clock ticks of 1/100 s, counted after the command name.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    return NaN;
  }
}

type Row = { nodes: number; clients: number; p50: number; p99: number; perClientPerS: number; oneSitePerS: number; allSitesPerS: number; cpuPer100: number; rssPer100: number; pausedP99?: number };

/**
 * When each reading was announced as stored: the worker publishes every committed reading on the
 * internal latest topic of its site right after the commit. Old entries are dropped as time goes.
 */
async function watchCommits(mqttPort: number, siteTags: string[]): Promise<{ committedAt: Map<string, number>; stop(): Promise<void> }> {
  const committedAt = new Map<string, number>();
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: `fanout-commits-${Date.now()}`, protocolVersion: 4, reconnectPeriod: 0 });
  sub.on('message', (topic, buf) => {
    const at = Date.now();
    for (const r of parseInternal(latestMessageSchema, topic, buf).readings) committedAt.set(`${r.probeTag}|${r.ts}`, at);
  });
  for (const tag of siteTags) await sub.subscribeAsync(latestTopic(tag), { qos: 0 });
  const prune = setInterval(() => {
    const cutoff = Date.now() - 30_000;
    for (const [k, at] of committedAt) if (at < cutoff) committedAt.delete(k);
  }, 10_000);
  return {
    committedAt,
    async stop() {
      clearInterval(prune);
      await sub.endAsync();
    },
  };
}

async function measure(screens: Screen[], apiPids: number[], windowS: number): Promise<Omit<Row, 'nodes' | 'clients' | 'rssPer100'> & { cpuPct: number }> {
  for (const s of screens) s.reset();
  const cpu0 = apiPids.map(cpuSeconds);
  const t0 = performance.now();
  await sleep(windowS * 1000);
  const elapsed = (performance.now() - t0) / 1000;
  const cpuPct = (100 * apiPids.reduce((a, pid, i) => a + cpuSeconds(pid) - cpu0[i]!, 0)) / elapsed;
  const lat = screens.flatMap((s) => s.latencies);
  const updates = screens.reduce((a, s) => a + s.updates, 0);
  const rate = (pick: (s: Screen) => boolean) => {
    const some = screens.filter(pick);
    return some.length ? some.reduce((a, s) => a + s.updates, 0) / some.length / elapsed : NaN;
  };
  return {
    p50: quantile(lat, 0.5), p99: quantile(lat, 0.99),
    perClientPerS: updates / screens.length / elapsed,
    oneSitePerS: rate((s) => s.sites === 1), allSitesPerS: rate((s) => s.sites > 1),
    cpuPct, cpuPer100: cpuPct / (screens.length / 100),
  };
}

const server = await benchServer(ROOT);
const rows: Row[] = [];
try {
  out(`fan-out benchmark: ${SHAPE.sites * SHAPE.circuits * SHAPE.tanksPerCircuit} tanks (${SHAPE.sites} sites × ${SHAPE.circuits} circuits × ${SHAPE.tanksPerCircuit}) at 1 Hz, ${WINDOW_S} s per figure, ${os.cpus().length} cores, load ${os.loadavg().map((l) => l.toFixed(2)).join(' / ')}`);
  for (const nodes of NODES) {
    const url = await server.newDatabase(`fanout_${nodes}`);
    const pool = createIngestPool(url, 3);
    const plant = await seedFanoutPlant(pool, SHAPE);
    const tokens = await roleTokens(pool, JWT_SECRET);
    const cluster = await startCluster({ databaseUrl: url, apiNodes: nodes, workers: 1, redis: nodes > 1 });
    const commits = await watchCommits(cluster.mqttPort, plant.sites.map((s) => s.tag));
    const gateways = await startGateways(cluster.mqttPort, plant.sites);
    try {
      await sleep(5_000);
      const rssBase = cluster.apiPids.reduce((a, pid) => a + (rssMiB(pid)?.rss ?? NaN), 0);
      for (const n of CLIENTS) {
        const screens = await connectScreens(cluster.apiPorts, n, tokens, plant.sites.map((s) => s.tag), commits.committedAt);
        await sleep(3_000);
        const m = await measure(screens, cluster.apiPids, WINDOW_S);
        const rss = cluster.apiPids.reduce((a, pid) => a + (rssMiB(pid)?.rss ?? NaN), 0);
        const row: Row = { nodes, clients: n, ...m, rssPer100: (rss - rssBase) / (n / 100) };
        // The same screens with paused clients beside them: their buffers fill, nobody else waits.
        const paused = await pausedScreens(cluster.apiPorts, PAUSED, tokens[0]!.token, plant.sites.map((s) => s.tag));
        await sleep(2_000);
        row.pausedP99 = (await measure(screens, cluster.apiPids, Math.max(5, WINDOW_S / 2))).p99;
        paused.close();
        for (const s of screens) s.close();
        rows.push(row);
        out(`${nodes} API node(s), ${n} clients: stored → client p50 ${fmt(row.p50)} ms, p99 ${fmt(row.p99)} ms; ${row.perClientPerS.toFixed(0)} tank updates/client/s (one-site screens ${row.oneSitePerS.toFixed(0)}, all-site screens ${row.allSitesPerS.toFixed(0)}); API CPU ${fmt(m.cpuPct)} % (${row.cpuPer100.toFixed(1)} % per 100 clients), RSS +${row.rssPer100.toFixed(1)} MiB per 100 clients; p99 with ${PAUSED} paused clients ${fmt(row.pausedP99)} ms`);
        await sleep(2_000);
      }
    } finally {
      await gateways.stop();
      await commits.stop();
      await cluster.close();
      await pool.end();
    }
  }
} finally {
  await server.stop();
}

const passes = (nodes: number) => {
  const over = rows.filter((r) => r.nodes === nodes && r.p99 > 1000).map((r) => r.clients);
  return over.length ? `p99 passes 1 s at ${Math.min(...over)} clients` : `p99 under 1 s up to ${Math.max(...rows.filter((r) => r.nodes === nodes).map((r) => r.clients))} clients (the most measured)`;
};
out('');
out('| API nodes | clients | stored → client p50 | p99 | p99 with paused clients | tank updates per client per s (one-site / all-site screens) | API CPU per 100 clients | API RSS per 100 clients |');
out('|---|---|---|---|---|---|---|---|');
for (const r of rows) out(`| ${r.nodes} | ${r.clients} | ${fmt(r.p50)} ms | ${fmt(r.p99)} ms | ${fmt(r.pausedP99 ?? NaN)} ms | ${r.perClientPerS.toFixed(0)} (${r.oneSitePerS.toFixed(0)} / ${r.allSitesPerS.toFixed(0)}) | ${r.cpuPer100.toFixed(1)} % of a core | ${r.rssPer100.toFixed(1)} MiB |`);
for (const nodes of NODES) out(`- ${nodes} API node(s): ${passes(nodes)}`);
writeBenchSection(ROOT, 'fanout', lines);
process.exit(0);
