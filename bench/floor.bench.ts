/**
 * npm run bench:floor — the Floor of a 500-tank site in headless Chromium while every tank reports
 * once a second through the real broker, ingest worker and API: how long until every tile shows a
 * value (first render with data), and the frame intervals (requestAnimationFrame) over a minute of
 * live updates, p50/p95/p99 and the share of frames over 20 ms. Figures go to
 * bench/results/latest.md under "bench:floor".
 * Settings: FLOOR_BENCH_S=60 (measuring time), FLOOR_BENCH_RUNS=3 (first renders).
 */
import { existsSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { createIngestPool } from '../api/src/db/pool.ts';
import { SESSION_COOKIE } from '../api/src/modules/auth/tokens.ts';
import { runInherited } from '../scripts/lib/proc.ts';
import { JWT_SECRET, startCluster } from '../tests/scale/lib/cluster.ts';
import { quantile } from './lib/bench-db.ts';
import { roleTokens, seedFanoutPlant, startGateways } from './lib/fanout-plant.ts';
import { writeBenchSection } from './lib/results.ts';
import { benchServer } from './lib/scale-phases.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const SECONDS = Number(process.env.FLOOR_BENCH_S ?? 60);
const RUNS = Number(process.env.FLOOR_BENCH_RUNS ?? 3);
const WEB_DIST = path.join(ROOT, 'dist/web');
const lines: string[] = [];
const out = (s: string) => {
  lines.push(s);
  process.stdout.write(s + '\n');
};
const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
process.env.RELIABILITY_LOG_LEVEL ??= 'error';

if (!existsSync(path.join(WEB_DIST, 'index.html'))) {
  out('building the web app (vite build)…');
  if ((await runInherited(['npx', 'vite', 'build'], { cwd: ROOT, env: process.env }).exit) !== 0) throw new Error('vite build failed');
}

const server = await benchServer(ROOT);
try {
  const url = await server.newDatabase('floor_bench');
  const pool = createIngestPool(url, 3);
  // One site of 500 tanks: the Floor at / shows all of them.
  const plant = await seedFanoutPlant(pool, { sites: 1, circuits: 20, tanksPerCircuit: 25 });
  const tokens = await roleTokens(pool, JWT_SECRET);
  const cluster = await startCluster({ databaseUrl: url, apiNodes: 1, workers: 1, extraEnv: { WEB_DIST } });
  const gateways = await startGateways(cluster.mqttPort, plant.sites);
  const browser = await chromium.launch({
    executablePath: '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-sync'],
  });
  try {
    await sleep(4_000);
    const base = `http://127.0.0.1:${cluster.apiPorts[0]}`;
    const context = await browser.newContext({ viewport: { width: 1920, height: 1080 } });
    await context.addCookies([{ name: SESSION_COOKIE, value: tokens.find((t) => t.role === 'operator')!.token, url: base }]);
    out(`Floor benchmark: ${plant.tanks} tanks on one site at 1 Hz, Chromium headless at 1920×1080, ${os.cpus().length} cores, load ${os.loadavg().map((l) => l.toFixed(2)).join(' / ')}`);

    const firsts: number[] = [];
    for (let run = 0; run < RUNS; run += 1) {
      const page = await context.newPage();
      const t0 = Date.now();
      await page.goto(base + '/');
      await page.waitForFunction(
        (n) => {
          const tiles = document.querySelectorAll('[data-testid="dense-circuit"] [data-testid="tank-tile"]');
          return tiles.length === n && [...tiles].every((t) => t.getAttribute('data-ts'));
        },
        plant.tanks,
        { timeout: 60_000, polling: 'raf' },
      );
      firsts.push(Date.now() - t0);
      if (run < RUNS - 1) await page.close();
    }
    out(`first render with data (navigation → all ${plant.tanks} tiles with a value): ${firsts.map((f) => `${f} ms`).join(', ')}; median ${quantile(firsts, 0.5)} ms`);

    const page = context.pages().at(-1)!;
    // As text: tsx would wrap a function literal with helpers the page does not have.
    const intervals = (await page.evaluate(`new Promise((resolve) => {
      const gaps = [];
      let last = performance.now();
      const end = last + ${SECONDS * 1000};
      const step = (t) => {
        gaps.push(t - last);
        last = t;
        if (t < end) requestAnimationFrame(step);
        else resolve(gaps);
      };
      requestAnimationFrame(step);
    })`)) as number[];
    const updated = (await page.evaluate(
      `[...document.querySelectorAll('[data-testid="dense-circuit"] [data-testid="tank-tile"]')].filter((t) => Date.now() - Date.parse(t.getAttribute('data-ts') || '') < 5000).length`,
    )) as number;
    const over = intervals.filter((g) => g > 20).length / intervals.length;
    out(`frame intervals over ${SECONDS} s of live updates (${intervals.length} frames): p50 ${quantile(intervals, 0.5).toFixed(1)} ms, p95 ${quantile(intervals, 0.95).toFixed(1)} ms, p99 ${quantile(intervals, 0.99).toFixed(1)} ms, max ${Math.max(...intervals).toFixed(0)} ms; ${(100 * over).toFixed(1)} % of frames over 20 ms`);
    out(`tiles with a reading under 5 s old at the end: ${updated} of ${plant.tanks}`);
    out(`targets: first render < 1,000 ms (${quantile(firsts, 0.5) < 1000 ? 'met' : 'not met'}), frame p95 < 20 ms (${quantile(intervals, 0.95) < 20 ? 'met' : 'not met'})`);
  } finally {
    await browser.close();
    await gateways.stop();
    await cluster.close();
    await pool.end();
  }
} finally {
  await server.stop();
}
writeBenchSection(ROOT, 'floor', lines);
process.exit(0);
