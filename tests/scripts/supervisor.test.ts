/**
 * `npm start` as a service manager or an operator sees it: the real supervisor with its own
 * MariaDB, broker, API, notifier and ingest worker (no simulator), in a scratch data folder on
 * free ports. Process listings (ps) are the evidence that nothing is left behind.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { chromium } from 'playwright-core';
import { afterAll, describe, expect, it, test } from 'vitest';
import { restartDelayMs } from '../../scripts/lib/children.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { pidAlive, sleep } from '../../scripts/lib/proc.ts';
import { readRunFile } from '../../scripts/lib/run-file.ts';
import { overflowX, SHOTS } from '../helpers/browser.ts';

const ROOT = path.resolve(import.meta.dirname, '../..');
const DIR = mkdtempSync(path.join(ROOT, '.data', 'test-supervisor-'));
const KEEP = ['PATH', 'HOME', 'LANG', 'TMPDIR', 'npm_config_cache'];

type Plant = { npm: ChildProcess; url: string; log: string[] };

async function startPlant(): Promise<Plant> {
  const ports = new Set<number>();
  while (ports.size < 4) ports.add(await findFreePort());
  const [PORT, DB_PORT, MQTT_PORT, SMTP_PORT] = [...ports].map(String);
  const env: NodeJS.ProcessEnv = Object.fromEntries(KEEP.filter((k) => process.env[k]).map((k) => [k, process.env[k]]));
  // INGEST_STOPPED_AFTER_S 30: the "ingest stopped" alarm clears 30 s after the last kill, leaving its 1-min escalation step time to fall due.
  Object.assign(env, { PORT, DB_PORT, MQTT_PORT, SMTP_PORT, SIMULATOR: 'off', DEMO_HISTORY: 'off', DEMO: 'on', FERRISIGHT_DATA_DIR: path.relative(ROOT, DIR), LOG_LEVEL: 'warn', INGEST_STOPPED_AFTER_S: '30' });
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

/** Signs a demo user in; returns the session cookie. */
async function signIn(url: string, email: string): Promise<string> {
  const res = await fetch(new URL('/api/auth/sign-in', url), {
    method: 'POST', headers: { 'content-type': 'application/json', 'x-ferrisight-csrf': '1' },
    body: JSON.stringify({ email, password: 'kestrel-demo' }),
  });
  expect(res.status).toBe(200);
  return res.headers.get('set-cookie')!.split(';')[0]!;
}

type IngestAlarm = { id: number; state: string; conditionActive: boolean; label: string; tankId: number | null };
/** The open "ingest stopped" alarm as the Alarm desk lists it, or null. */
async function ingestAlarm(url: string, cookie: string): Promise<IngestAlarm | null> {
  const res = await fetch(new URL('/api/alarms/active', url), { headers: { cookie }, signal: AbortSignal.timeout(5000) });
  const body = (await res.json()) as { alarms: Array<IngestAlarm & { kind: string }> };
  return body.alarms.find((a) => a.kind === 'ingest-stopped') ?? null;
}

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
  test('when the ingest worker is SIGKILLed 20 times in a minute, then API, broker, notifier and MariaDB never stop, the Floor keeps serving, the "ingest stopped" alarm is raised and mailed, and it clears once the worker is back', async () => {
    const plant = await startPlant();
    const steady = { broker: partPid('broker'), api: partPid('api'), notifier: partPid('notifier'), mail: partPid('mail'), mariadb: mariadbPid() };
    for (const pid of Object.values(steady)) expect(pid).toBeGreaterThan(0);
    const admin = await signIn(plant.url, 'admin@kestrel.example');
    const operator = await signIn(plant.url, 'operator@kestrel.example');
    // The engineer on call is mailed after 1 min unacknowledged (the demo waits 5), so the mail falls due during the kills.
    const policy = await fetch(new URL('/api/roster/policy', plant.url), {
      method: 'PUT', headers: { 'content-type': 'application/json', 'x-ferrisight-csrf': '1', cookie: admin },
      body: JSON.stringify({ priority: 1, steps: [{ afterMin: 1, notify: ['primary'] }], reason: 'Supervisor test: first call after a minute' }),
    });
    expect(policy.status).toBe(200);
    expect(await ingestAlarm(plant.url, operator)).toBeNull();
    const floorUp = async () => (await fetch(new URL('/api/plant', plant.url), { headers: { cookie: operator }, signal: AbortSignal.timeout(3000) }).catch(() => null))?.ok === true;

    let kills = 0;
    let apiFailures = 0;
    let floorFailures = 0;
    const t0 = Date.now();
    let raisedAfterMs: number | null = null;
    for (let i = 0; i < 20; i += 1) {
      const t = Date.now();
      const pid = partPid('ingest');
      if (pid && pidAlive(pid)) {
        process.kill(pid, 'SIGKILL');
        kills += 1;
      }
      if (!(await apiUp(plant.url))) apiFailures += 1;
      if (!(await floorUp())) floorFailures += 1;
      if (raisedAfterMs === null && (await ingestAlarm(plant.url, operator))?.conditionActive) raisedAfterMs = Date.now() - t0;
      for (const [name, p] of Object.entries(steady)) expect(pidAlive(p!), `${name} still running`).toBe(true);
      await sleep(Math.max(0, 3000 - (Date.now() - t)));
    }
    const killsEnded = Date.now();
    // 1 s pauses for the first 20 restarts in a row, then growing; once it is left alone it is back.
    const backMs = await waitUntil('ingest running again', () => readRunFile(DIR).states?.find((s) => s.name === 'ingest')?.state === 'running', 45_000);
    const ingest = readRunFile(DIR).states!.find((s) => s.name === 'ingest')!;
    console.log(`worker SIGKILLed ${kills} times in 60 s; restarts recorded ${ingest.restarts}; API answered ${20 - apiFailures}/20 checks; worker back ${(backMs / 1000).toFixed(1)} s after the last kill`);
    expect(kills).toBe(20);
    expect(ingest.restarts).toBeGreaterThanOrEqual(kills);
    expect(ingest.lastExit?.how).toBe('signal SIGKILL');
    expect(apiFailures).toBe(0);
    expect(floorFailures).toBe(0);
    for (const [name, p] of Object.entries(steady)) expect(pidAlive(p!), `${name} still running`).toBe(true);
    expect(plant.log.join('\n')).not.toMatch(/giving up/);

    // Raised during the kills, as a P1 of no tank, for everyone on the Alarm desk.
    expect(raisedAfterMs, 'ingest-stopped alarm raised during the kills').not.toBeNull();
    const raised = (await ingestAlarm(plant.url, operator))!;
    expect(raised).toMatchObject({ label: 'Ingest stopped: readings are not being stored', tankId: null });
    // An operator's phone (390 px) shows it on the Floor, plainly, without sideways scrolling.
    mkdirSync(SHOTS, { recursive: true });
    const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-sync'] });
    const phone = await (await browser.newContext({ viewport: { width: 390, height: 844 } })).newPage();
    await phone.goto(new URL('/sign-in', plant.url).href);
    await phone.getByLabel('E-mail').fill('operator@kestrel.example');
    await phone.getByLabel('Password').fill('kestrel-demo');
    await phone.getByRole('button', { name: 'Sign in' }).click();
    await phone.waitForURL((u) => !u.pathname.startsWith('/sign-in'), { timeout: 20_000 });
    const banner = phone.getByTestId('plant-alarm-banner');
    await banner.getByText('Ingest stopped: readings are not being stored').waitFor({ timeout: 20_000 });
    expect(await overflowX(phone)).toBe(0);
    await phone.screenshot({ path: path.join(SHOTS, 'ingest-stopped-floor-390.png') });
    // Escalated by e-mail like any other alarm: the engineer on call gets a mail of their own, caught by the local catcher.
    const mailOf = async () => {
      const res = await fetch(new URL('/api/admin/mail?limit=500', plant.url), { headers: { cookie: admin } });
      return ((await res.json()) as { mail: Array<{ subject: string; headers: Record<string, string> }> }).mail
        .find((m) => m.headers['x-ferrisight-alarm'] === String(raised.id));
    };
    await waitUntil('escalation mail for the ingest-stopped alarm', async () => (await mailOf()) !== undefined, 90_000);
    expect((await mailOf())!.subject).toBe('P1 Plant: Ingest stopped: readings are not being stored, unacknowledged (step 1)');
    // Clears once the worker has run 30 s without an exit.
    await waitUntil('ingest-stopped alarm cleared', async () => (await ingestAlarm(plant.url, operator))?.conditionActive === false, 120_000);
    const clearedAfterKillsS = (Date.now() - killsEnded) / 1000;
    const cleared = (await ingestAlarm(plant.url, operator))!;
    expect(cleared).toMatchObject({ id: raised.id, state: 'rtn-unacknowledged' });
    // The operator acknowledges it from the banner on the phone; back to normal and acknowledged, it leaves every screen.
    await banner.getByRole('button', { name: 'Acknowledge Ingest stopped: readings are not being stored' }).click();
    await banner.waitFor({ state: 'detached', timeout: 20_000 });
    await browser.close();
    expect(await ingestAlarm(plant.url, operator)).toBeNull();
    console.log(`ingest-stopped alarm raised ${((raisedAfterMs ?? 0) / 1000).toFixed(1)} s after the first kill, mailed, cleared ${clearedAfterKillsS.toFixed(1)} s after the last kill; Floor answered ${20 - floorFailures}/20 checks`);

    // The same states reach Plant setup's health panel through the API.
    const cookie = admin;
    const health = (await (await fetch(new URL('/api/admin/ingest-health', plant.url), { headers: { cookie } })).json()) as { parts: { name: string; restarts: number }[]; workers: { worker: string; stopped: boolean }[]; ingestAlarm: { instanceId: number | null } | null };
    expect(health.workers.filter((w) => !w.stopped)).toHaveLength(1);
    expect(health.ingestAlarm).toMatchObject({ instanceId: null });
    expect(health.parts.find((p) => p.name === 'ingest')!.restarts).toBe(ingest.restarts);
    expect(health.parts.map((p) => p.name)).toEqual(expect.arrayContaining(['broker', 'api', 'notifier', 'ingest']));

    await stopBy(plant, 'SIGTERM');
  }, 420_000);

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
