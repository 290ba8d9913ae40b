/**
 * `npm start` as a service manager or an operator sees it: the real supervisor with its own
 * MariaDB, broker, API, notifier and ingest worker (no simulator), in a scratch data folder on
 * free ports. Process listings (ps) are the evidence that nothing is left behind.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { afterAll, describe, expect, it, test } from 'vitest';
import { restartDelayMs } from '../../scripts/lib/children.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { pidAlive, sleep } from '../../scripts/lib/proc.ts';
import { readRunFile } from '../../scripts/lib/run-file.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
const DIR = mkdtempSync(path.join(ROOT, '.data', 'test-supervisor-'));
const KEEP = ['PATH', 'HOME', 'LANG', 'TMPDIR', 'npm_config_cache'];

type Plant = { npm: ChildProcess; url: string; log: string[] };

async function startPlant(): Promise<Plant> {
  const ports = new Set<number>();
  while (ports.size < 4) ports.add(await findFreePort());
  const [PORT, DB_PORT, MQTT_PORT, SMTP_PORT] = [...ports].map(String);
  const env: NodeJS.ProcessEnv = Object.fromEntries(KEEP.filter((k) => process.env[k]).map((k) => [k, process.env[k]]));
  Object.assign(env, { PORT, DB_PORT, MQTT_PORT, SMTP_PORT, SIMULATOR: 'off', DEMO_HISTORY: 'off', DEMO: 'on', FERRISIGHT_DATA_DIR: path.relative(ROOT, DIR), LOG_LEVEL: 'warn' });
  // Its own process group, like a service manager's unit: the test signals one PID only.
  const npm = spawn('npm', ['start'], { cwd: ROOT, env, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
  const log: string[] = [];
  const url = await new Promise<string>((resolve, reject) => {
    const onLine = (line: string) => {
      log.push(line);
      const m = /Ferrisight is running: (http:\/\/\S+)/.exec(line);
      if (m) resolve(m[1]!);
    };
    createInterface({ input: npm.stdout! }).on('line', onLine);
    createInterface({ input: npm.stderr! }).on('line', onLine);
    npm.once('exit', (code) => reject(new Error(`npm start exited (${code}):\n${log.slice(-30).join('\n')}`)));
  });
  return { npm, url, log };
}

/** pid → command line of every process whose ancestry leads to `root`, plus the MariaDB of the data folder. */
function processTree(root: number): Map<number, string> {
  const rows = execFileSync('ps', ['-eo', 'pid=,ppid=,args='], { encoding: 'utf8' })
    .split('\n')
    .map((l) => /^\s*(\d+)\s+(\d+)\s+(.*)$/.exec(l))
    .filter((m): m is RegExpExecArray => m !== null)
    .map((m) => ({ pid: Number(m[1]), ppid: Number(m[2]), args: m[3]! }));
  const out = new Map<number, string>();
  const add = (pid: number) => {
    for (const r of rows) {
      if (r.ppid !== pid || out.has(r.pid)) continue;
      out.set(r.pid, r.args);
      add(r.pid);
    }
  };
  const self = rows.find((r) => r.pid === root);
  if (self) out.set(root, self.args);
  add(root);
  for (const r of rows) if (r.args.includes(DIR)) out.set(r.pid, r.args);
  return out;
}

/** Processes of the recorded set (same pid and command line) or of the data folder still in the listing. */
function leftovers(before: Map<number, string>): string[] {
  return execFileSync('ps', ['-eo', 'pid=,args='], { encoding: 'utf8' })
    .split('\n')
    .map((l) => /^\s*(\d+)\s+(.*)$/.exec(l))
    .filter((m): m is RegExpExecArray => m !== null)
    .filter((m) => before.get(Number(m[1])) === m[2] || m[2]!.includes(DIR))
    .map((m) => m[0].trim());
}

async function waitUntil(what: string, ok: () => boolean | Promise<boolean>, timeoutMs: number): Promise<number> {
  const t0 = Date.now();
  while (!(await ok())) {
    if (Date.now() - t0 > timeoutMs) throw new Error(`${what}: not within ${timeoutMs / 1000} s`);
    await sleep(200);
  }
  return Date.now() - t0;
}

const partPid = (name: string) => readRunFile(DIR).parts?.[name];
const mariadbPid = () => Number(readFileSync(path.join(DIR, 'mariadb/run/mariadb.pid'), 'utf8').trim());
const apiUp = async (url: string) => {
  try {
    return (await fetch(new URL('/api/health', url), { signal: AbortSignal.timeout(3000) })).ok;
  } catch {
    return false;
  }
};

afterAll(async () => {
  // Whatever a failed test left: stop it the way an operator would, then remove the folder.
  const run = readRunFile(DIR);
  if (run.pid && pidAlive(run.pid)) {
    process.kill(run.pid, 'SIGTERM');
    await waitUntil('supervisor stopped', () => !pidAlive(run.pid!), 30_000).catch(() => {});
  }
  if (existsSync(DIR)) rmSync(DIR, { recursive: true, force: true });
}, 60_000);

describe('npm start supervisor', () => {
  test('when the ingest worker is SIGKILLed 20 times in a minute, then API, broker, notifier and MariaDB never stop, the API keeps serving, and the worker is back afterwards', async () => {
    const plant = await startPlant();
    const steady = { broker: partPid('broker'), api: partPid('api'), notifier: partPid('notifier'), mail: partPid('mail'), mariadb: mariadbPid() };
    for (const pid of Object.values(steady)) expect(pid).toBeGreaterThan(0);
    let kills = 0;
    let apiFailures = 0;
    for (let i = 0; i < 20; i += 1) {
      const t = Date.now();
      const pid = partPid('ingest');
      if (pid && pidAlive(pid)) {
        process.kill(pid, 'SIGKILL');
        kills += 1;
      }
      if (!(await apiUp(plant.url))) apiFailures += 1;
      for (const [name, p] of Object.entries(steady)) expect(pidAlive(p!), `${name} still running`).toBe(true);
      await sleep(Math.max(0, 3000 - (Date.now() - t)));
    }
    // 1 s pauses for the first 20 restarts in a row, then growing; once it is left alone it is back.
    const backMs = await waitUntil('ingest running again', () => readRunFile(DIR).states?.find((s) => s.name === 'ingest')?.state === 'running', 45_000);
    const ingest = readRunFile(DIR).states!.find((s) => s.name === 'ingest')!;
    console.log(`worker SIGKILLed ${kills} times in 60 s; restarts recorded ${ingest.restarts}; API answered ${20 - apiFailures}/20 checks; worker back ${(backMs / 1000).toFixed(1)} s after the last kill`);
    expect(kills).toBe(20);
    expect(ingest.restarts).toBeGreaterThanOrEqual(kills);
    expect(ingest.lastExit?.how).toBe('signal SIGKILL');
    expect(apiFailures).toBe(0);
    for (const [name, p] of Object.entries(steady)) expect(pidAlive(p!), `${name} still running`).toBe(true);
    expect(plant.log.join('\n')).not.toMatch(/giving up/);

    // The same states reach Plant setup's health panel through the API.
    const signIn = await fetch(new URL('/api/auth/sign-in', plant.url), {
      method: 'POST', headers: { 'content-type': 'application/json', 'x-ferrisight-csrf': '1' },
      body: JSON.stringify({ email: 'admin@kestrel.example', password: 'kestrel-demo' }),
    });
    expect(signIn.status).toBe(200);
    const cookie = signIn.headers.get('set-cookie')!.split(';')[0]!;
    const health = (await (await fetch(new URL('/api/admin/ingest-health', plant.url), { headers: { cookie } })).json()) as { parts: { name: string; restarts: number }[] };
    expect(health.parts.find((p) => p.name === 'ingest')!.restarts).toBe(ingest.restarts);
    expect(health.parts.map((p) => p.name)).toEqual(expect.arrayContaining(['broker', 'api', 'notifier', 'ingest']));

    await stopBy(plant, 'SIGTERM');
  }, 240_000);

  async function stopBy(plant: Plant, sig: NodeJS.Signals): Promise<void> {
    const tree = processTree(plant.npm.pid!);
    expect([...tree.values()].some((a) => a.includes('mariadbd'))).toBe(true);
    expect([...tree.values()].some((a) => a.includes('ingest/worker.ts'))).toBe(true);
    const t0 = Date.now();
    process.kill(plant.npm.pid!, sig); // the npm process alone, not its group
    await waitUntil(`everything gone after ${sig}`, () => leftovers(tree).length === 0, 60_000).catch(() => {});
    const left = leftovers(tree);
    console.log(`${sig} to npm start (pid ${plant.npm.pid}): ${tree.size} processes before, ${left.length} after ${((Date.now() - t0) / 1000).toFixed(1)} s`);
    expect(left).toEqual([]);
  }

  test('when SIGINT goes to the npm start process alone, then no process of the app or its MariaDB is left', async () => {
    await stopBy(await startPlant(), 'SIGINT');
  }, 120_000);

  test('when the supervisor is SIGKILLed, then its parts and MariaDB stop within 10 s', async () => {
    const plant = await startPlant();
    const tree = processTree(plant.npm.pid!);
    const supervisor = readRunFile(DIR).pid!;
    expect(tree.get(supervisor)).toMatch(/run-plant\.ts/);
    const t0 = Date.now();
    process.kill(supervisor, 'SIGKILL');
    const ms = await waitUntil('parts gone', () => leftovers(tree).length === 0, 10_000).catch(() => Date.now() - t0);
    console.log(`supervisor SIGKILLed: ${tree.size} processes before, ${leftovers(tree).length} left after ${(ms / 1000).toFixed(1)} s`);
    expect(leftovers(tree)).toEqual([]);
  }, 120_000);
});

describe('restart pauses', () => {
  it('when a part keeps crashing, then it is restarted after 1 s twenty times, then after growing pauses capped at 30 s, and never given up', () => {
    const pauses = Array.from({ length: 200 }, (_, i) => restartDelayMs(i + 1));
    expect(pauses.slice(0, 20).every((ms) => ms === 1000)).toBe(true);
    expect(pauses.slice(20, 26)).toEqual([2000, 4000, 8000, 16_000, 30_000, 30_000]);
    expect(pauses.every((ms) => Number.isFinite(ms) && ms <= 30_000)).toBe(true);
  });
});
