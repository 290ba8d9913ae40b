/**
 * npm run bench — runs bench:ingest, bench:alarms and bench:trend one after the other (each
 * starts its own private MariaDB in .data/bench-mariadb, so they cannot overlap) and writes
 * bench/results/latest.md: the machine, the versions, every figure as printed, and the ratios
 * to the ceilings measured in the same run. Running it on another machine gives that machine's.
 */
import { spawn } from 'node:child_process';
import { readFileSync, renameSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { runCommand } from '../scripts/lib/proc.ts';
import { otherSections } from './lib/results.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const BENCHES = ['ingest', 'alarms', 'trend'] as const;
type Run = { name: string; code: number | null; seconds: number; lines: string[]; result: Record<string, unknown> | null };

function runBench(name: string): Promise<Run> {
  const started = Date.now();
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', `bench/${name}.bench.ts`], { cwd: ROOT, stdio: ['ignore', 'pipe', 'inherit'] });
    let text = '';
    child.stdout.setEncoding('utf8').on('data', (d: string) => {
      text += d;
      process.stdout.write(d);
    });
    child.on('exit', (code) => {
      const lines = text.split('\n').filter(Boolean);
      const res = lines.find((l) => l.startsWith('RESULT '));
      resolve({ name, code, seconds: (Date.now() - started) / 1000, lines: lines.filter((l) => !l.startsWith('RESULT ')), result: res ? JSON.parse(res.slice(7)) : null });
    });
  });
}

async function versions(): Promise<string[]> {
  const pkg = JSON.parse(readFileSync(path.join(ROOT, 'package.json'), 'utf8')) as { dependencies: Record<string, string> };
  const mariadbd = (await runCommand('mariadbd', ['--version'], { timeoutMs: 5_000 })).stdout.trim() || 'mariadbd not found';
  const deps = ['aedes', 'aedes-persistence-level', 'mqtt', 'mariadb', 'sequelize', 'socket.io', 'express'].map((d) => `${d} ${pkg.dependencies[d] ?? '?'}`);
  return [`Node ${process.version}`, mariadbd.replace(/^.*Ver /, 'MariaDB ').split(' for ')[0], ...deps];
}

const pct = (x: unknown) => (typeof x === 'number' && Number.isFinite(x) ? `${(100 * x).toFixed(0)} %` : 'n/a');
const num = (x: unknown) => (typeof x === 'number' && Number.isFinite(x) ? Math.round(x).toLocaleString('en') : 'n/a');
const get = (o: Record<string, unknown> | null, p: string): unknown => p.split('.').reduce<unknown>((a, k) => (a as Record<string, unknown> | undefined)?.[k], o ?? undefined);

// Figures on a shared machine move with its load: both ends are written down.
const loadAtStart = os.loadavg();
const runs: Run[] = [];
for (const name of BENCHES) {
  process.stdout.write(`\n── bench:${name} ──\n`);
  runs.push(await runBench(name));
}
const ingest = runs.find((r) => r.name === 'ingest')?.result ?? null;
const alarms = runs.find((r) => r.name === 'alarms')?.result ?? null;
const cpu = os.cpus();
const md = [
  '# Benchmark results (latest run)',
  '',
  `Run ${new Date().toISOString()} with \`npm run bench\` (reproduce: same command; each bench alone: \`npm run bench:ingest\`, \`bench:alarms\`, \`bench:trend\`).`,
  '',
  '## Machine',
  `- ${cpu[0]?.model ?? 'unknown CPU'}, ${cpu.length} cores, ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB RAM, load average (1/5/15 min) ${loadAtStart.map((l) => l.toFixed(2)).join(' / ')} at the start, ${os.loadavg().map((l) => l.toFixed(2)).join(' / ')} at the end`,
  `- ${os.type()} ${os.release()} (${os.arch()}); everything (MariaDB, broker, worker, API, load generator) on this one machine over loopback`,
  '',
  '## Versions',
  ...(await versions()).map((v) => `- ${v}`),
  '',
  '## Ratios to the ceilings measured in the same run',
  '| Figure | Pipeline | Ceiling | Ratio | Target |',
  '|---|---|---|---|---|',
  `| (a) 1,000-reading batches, readings/s | ${num(get(ingest, 'batchReadingsPerS'))} | ${num(get(ingest, 'insertCeilingRowsPerS'))} (MariaDB multi-row INSERT) | ${pct(get(ingest, 'ratioA'))} | ≥ 50 % |`,
  `| (b) single readings from 200 connections, readings/s | ${num(get(ingest, 'singleReadingsPerS'))} | ${num(get(ingest, 'passThroughSingleMsgPerS'))} (broker QoS 1 pass-through to a clean: false subscriber, msg/s; clean session: ${num(get(ingest, 'passThroughSingleCleanSessionMsgPerS'))}) | ${pct(get(ingest, 'ratioB'))} | ≥ 50 % |`,
  `| publish → socket.io p99 at 2,000 readings/s, ms | ${num(get(ingest, 'latency.total.p99'))} | | | < 1,000 |`,
  `| out-of-band reading → alarm at socket.io p99, ms | ${num(get(alarms, 'toClient.p99'))} | | | < 1,000 |`,
  '',
  ...runs.flatMap((r) => [`## bench:${r.name} (${r.seconds.toFixed(0)} s${r.code === 0 ? '' : `, EXIT ${r.code}`})`, '```', ...r.lines, '```', '']),
  // Benchmarks run on their own (bench:fanout, bench:floor…) keep their latest section.
  ...otherSections(ROOT, BENCHES),
].join('\n');
const file = path.join(ROOT, 'bench/results/latest.md');
writeFileSync(`${file}.tmp`, md);
renameSync(`${file}.tmp`, file);
process.stdout.write(`\nwrote ${path.relative(ROOT, file)}\n`);
process.exit(runs.every((r) => r.code === 0) ? 0 : 1);
