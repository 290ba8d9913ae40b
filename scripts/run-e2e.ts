/**
 * The browser tests (tests/e2e/) against a whole running app: the last stage of `npm test`,
 * or alone with `npm run test:e2e [-- vitest args]`.
 *
 * Starts scripts/run-plant.ts (the `npm start` supervisor: MariaDB, broker, mail catcher,
 * API and web app, notifier, ingest, simulator with the demo week) on a data folder of its
 * own, .data/test-e2e/ (wiped every run; .data/test-e2e-<pid>/ while another run holds it),
 * and on free ports, so it runs beside a developer's `npm start`. Waits for the app's address,
 * runs `vitest run tests/e2e` with E2E_BASE_URL and E2E_PASSWORD, then stops the app
 * (SIGTERM: run-plant stops its parts and its MariaDB) whether the tests pass, fail or are
 * interrupted. The app's output goes to <data folder>/plant.log, screenshots to test-results/.
 *
 * A second app, a real site from an empty database (DEMO=off, SIMULATOR=off: no demo plant,
 * no demo users, a one-time first-run link), starts in .data/test-e2e-site/ for the
 * commissioning test (tests/e2e/commissioning.test.ts) when it is among the files run; its
 * address, first-run link and MQTT port reach the tests as E2E_SITE_URL, E2E_SITE_FIRST_RUN
 * and E2E_SITE_MQTT_PORT.
 *
 * Settings: E2E_START_TIMEOUT_S=240 (how long the app may take to come up).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createWriteStream, existsSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { createInterface } from 'node:readline';
import { fileURLToPath } from 'node:url';
import { stopMariadb } from './lib/mariadb.ts';
import { findFreePort } from './lib/ports.ts';
import { finisher, onFirstSignal, runInherited, seconds, sleep, waitForExit } from './lib/proc.ts';
import { liveSupervisor, readRunFile, stopLeftoverParts } from './lib/run-file.ts';
import { claimScratchDir, type ScratchDir } from './lib/scratch-dir.ts';
import { ensurePrivateDir, loadSecrets } from './lib/secrets.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DATA_DIR = path.join(ROOT, '.data');
const args = process.argv.slice(2);
const START_TIMEOUT_MS = Number(process.env.E2E_START_TIMEOUT_S || 240) * 1000;

const say = (line: string) => process.stdout.write(line + '\n');
const fail = (line: string) => process.stderr.write(line + '\n');
process.stdout.on('error', () => {});

/**
 * Settings a developer may have exported for their own `npm start` or a site: none of them
 * may reach the test app, which must use only what it starts itself.
 */
const NOT_INHERITED = [
  'DATABASE_URL', 'DATABASE_READ_URL', 'MQTT_URL', 'SMTP_URL', 'REDIS_URL', 'PUBLIC_URL', 'JWT_SECRET',
  'SERVICE_MQTT_PASSWORD', 'SIM_DEVICE_PASSWORD', 'SIMULATOR', 'DEMO', 'DEMO_HISTORY', 'WEB_DIST', 'HOST',
  'PORT', 'DB_PORT', 'MQTT_PORT', 'SMTP_PORT', 'WEB_DEV_PORT', 'RAW_RETENTION_DAYS', 'INGEST_SLICE', 'INGEST_SLICE_BY',
  'INGEST_SHARED_GROUP', 'E2E_BASE_URL', 'FERRISIGHT_DATA_DIR', 'NODE_ENV',
];

type App = { scratch: ScratchDir; child?: ChildProcess; exited?: Promise<void> };
/** The demo app and, for the commissioning test, the empty site: stopped in reverse order. */
const apps: App[] = [];
let current: ChildProcess | undefined;
let interrupted = false;

/** Stops whatever an earlier run left in `dir`: its supervisor (which stops the rest), stray parts, MariaDB. */
async function stopLeftovers(dir: string): Promise<void> {
  const run = readRunFile(dir);
  const pid = liveSupervisor(run);
  if (pid) {
    process.kill(pid, 'SIGTERM');
    if (!(await waitForExit(pid, 60_000))) process.kill(pid, 'SIGKILL');
  }
  await stopLeftoverParts(readRunFile(dir));
  await stopMariadb({ baseDir: path.join(dir, 'mariadb'), port: 0 });
}

/** Four different free ports. */
async function freePorts(): Promise<number[]> {
  const ports = new Set<number>();
  while (ports.size < 4) ports.add(await findFreePort());
  return [...ports];
}

type Started = { url: string } | { exitCode: number; portTaken: boolean } | { timedOut: true };

/** Starts run-plant; resolves with its address once it prints it, or with its exit. */
function startPlant(app: App, env: NodeJS.ProcessEnv, log: NodeJS.WritableStream): Promise<Started> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'scripts/run-plant.ts')], {
      cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'],
    });
    app.child = child;
    app.exited = new Promise((r) => child.once('exit', () => r()));
    let portTaken = false;
    let inBanner = false;
    const onLine = (line: string) => {
      log.write(line + '\n');
      if (/^Port \d+ is taken/.test(line)) portTaken = true;
      const m = /Ferrisight is running: (http:\/\/\S+)/.exec(line);
      if (m) {
        inBanner = true;
        resolve({ url: m[1]! });
        return;
      }
      // The supervisor's own lines (not a part's "name │ …" and not the sign-in banner) show progress.
      if (inBanner) inBanner = line.trim() !== '';
      else if (!/^\S*\s*│/.test(line) && line.trim()) say(`  app: ${line}`);
    };
    createInterface({ input: child.stdout! }).on('line', onLine);
    createInterface({ input: child.stderr! }).on('line', onLine);
    child.on('exit', (code, signal) => resolve({ exitCode: code ?? (signal ? 128 : 1), portTaken }));
    child.on('error', (err) => {
      fail(String(err));
      resolve({ exitCode: 127, portTaken: false });
    });
  });
}

async function waitForHealth(url: string, timeoutMs: number): Promise<boolean> {
  const until = Date.now() + timeoutMs;
  while (!interrupted && Date.now() < until) {
    try {
      if ((await fetch(new URL('/api/health', url), { signal: AbortSignal.timeout(2000) })).ok) return true;
    } catch {
      /* not yet */
    }
    await sleep(500);
  }
  return false;
}

async function stopPlant(app: App): Promise<void> {
  const { child, scratch } = app;
  if (!child) return;
  const t = Date.now();
  if (child.exitCode === null && child.signalCode === null) {
    child.kill('SIGTERM');
    const done = await Promise.race([app.exited!.then(() => true), sleep(60_000).then(() => false)]);
    if (!done) {
      fail('The test app did not stop within 60 s: killing it');
      child.kill('SIGKILL');
      await app.exited;
    }
  }
  // After a clean stop there is nothing left; after a crash or a kill, stray parts and MariaDB.
  await stopLeftovers(scratch.dir);
  say(`Test app stopped (${seconds(Date.now() - t)})`);
}

async function runVitest(env: NodeJS.ProcessEnv): Promise<number> {
  const local = path.join(ROOT, 'node_modules/.bin/vitest');
  // Named files or filters replace the default folder; options alone keep it.
  const targets = args.some((a) => !a.startsWith('-')) ? args : ['tests/e2e', ...args];
  const step = runInherited([...(existsSync(local) ? [local] : ['npx', 'vitest']), 'run', ...targets], { cwd: ROOT, env });
  current = step.child;
  const code = await step.exit;
  current = undefined;
  return code;
}

const finish = finisher(async () => {
  for (const app of [...apps].reverse()) {
    await stopPlant(app).catch((err) => fail(`Could not stop the test app: ${(err as Error).message}`));
    app.scratch.release();
  }
});

onFirstSignal(() => {
  interrupted = true;
  // A terminal Ctrl-C reached vitest and the app too (same process group); SIGTERM covers the rest.
  if (current && current.exitCode === null) current.kill('SIGTERM');
  void finish(130);
});

function demoPassword(): string {
  const users = JSON.parse(readFileSync(path.join(ROOT, 'scripts/demo-users.json'), 'utf8')) as { password: string }[];
  return users[0]!.password;
}

/** Claims a wiped data folder and starts run-plant on free ports with these extra settings; null when it failed (already reported). */
async function startApp(name: string, label: string, extra: NodeJS.ProcessEnv, base: NodeJS.ProcessEnv): Promise<{ url: string; dir: string; mqttPort: number } | null> {
  const scratch = await claimScratchDir(DATA_DIR, name, async (dir) => stopLeftovers(dir), say);
  const app: App = { scratch };
  apps.push(app);
  const dir = scratch.dir;
  await stopLeftovers(dir);
  rmSync(dir, { recursive: true, force: true });
  ensurePrivateDir(dir);
  const logFile = path.join(dir, 'plant.log');
  const log = createWriteStream(logFile);
  const rel = (p: string) => path.relative(ROOT, p);
  let started: Started | undefined;
  let mqttPort = 0;
  for (let attempt = 1; attempt <= 3 && !interrupted; attempt++) {
    const [port, dbPort, mqtt, smtpPort] = await freePorts();
    mqttPort = mqtt!;
    say(`Starting ${label} on 127.0.0.1:${port} (data in ${rel(dir)}/, log in ${rel(logFile)})`);
    const env: NodeJS.ProcessEnv = {
      ...base,
      FERRISIGHT_DATA_DIR: dir,
      WEB_DIST: path.join(apps[0]!.scratch.dir, 'web'),
      PORT: String(port),
      DB_PORT: String(dbPort),
      MQTT_PORT: String(mqttPort),
      SMTP_PORT: String(smtpPort),
      ...extra,
    };
    const timeout = sleep(START_TIMEOUT_MS).then((): Started => ({ timedOut: true }));
    started = await Promise.race([startPlant(app, env, log), timeout]);
    // Another process took one of the ports between the pick and the start: pick again.
    if (!('exitCode' in started && started.portTaken)) break;
  }
  if (interrupted) return null;
  if (!started || !('url' in started)) {
    const why = !started ? 'did not start' : 'timedOut' in started ? `did not come up within ${START_TIMEOUT_MS / 1000} s` : `exited (${started.exitCode})`;
    fail(`${label} ${why}; its output is in ${rel(logFile)}:`);
    fail(tail(logFile, 30));
    return null;
  }
  if (!(await waitForHealth(started.url, 60_000))) {
    if (!interrupted) {
      fail(`${label} at ${started.url} does not answer /api/health; its output is in ${rel(logFile)}:`);
      fail(tail(logFile, 30));
    }
    return null;
  }
  return { url: started.url, dir, mqttPort };
}

async function main(): Promise<void> {
  const t0 = Date.now();
  ensurePrivateDir(DATA_DIR);
  const base: NodeJS.ProcessEnv = { ...process.env };
  for (const k of NOT_INHERITED) delete base[k];
  const demo = await startApp('test-e2e', 'the app for the browser tests', {}, base);
  if (interrupted) return;
  if (!demo) return void (await finish(1));
  say(`App up at ${demo.url} (${seconds(Date.now() - t0)})`);

  const env: NodeJS.ProcessEnv = { ...base, E2E_BASE_URL: demo.url, E2E_PASSWORD: demoPassword() };
  // The Sparkplug browser test connects an edge node with the demo site's device account.
  Object.assign(env, { E2E_MQTT_URL: `mqtt://127.0.0.1:${demo.mqttPort}`, E2E_DEVICE_USER: 'sim-kestrel', E2E_DEVICE_PASSWORD: loadSecrets(demo.dir).SIM_DEVICE_PASSWORD });
  const files = args.filter((a) => !a.startsWith('-'));
  if (files.length === 0 || files.some((f) => f.includes('commissioning'))) {
    const site = await startApp('test-e2e-site', 'an empty site (no demo data) for the commissioning test', { DEMO: 'off', SIMULATOR: 'off', DEMO_HISTORY: 'off' }, base);
    if (interrupted) return;
    if (!site) return void (await finish(1));
    Object.assign(env, {
      E2E_SITE_URL: site.url,
      E2E_SITE_MQTT_PORT: String(site.mqttPort),
      E2E_SITE_FIRST_RUN: readFileSync(path.join(site.dir, 'first-run-link.txt'), 'utf8').trim(),
    });
    say(`Empty site up at ${site.url}`);
  }

  const code = await runVitest(env);
  if (interrupted) return;
  if (code !== 0) say(`The apps' output is in ${apps.map((a) => path.relative(ROOT, path.join(a.scratch.dir, 'plant.log'))).join(' and ')}; screenshots in test-results/`);
  await finish(code);
}

function tail(file: string, lines: number): string {
  try {
    return readFileSync(file, 'utf8').trimEnd().split('\n').slice(-lines).join('\n');
  } catch {
    return '(no output)';
  }
}

main().catch((err) => {
  fail(`The browser tests failed to start: ${(err as Error).stack ?? err}`);
  void finish(1);
});
