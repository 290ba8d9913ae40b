/**
 * npm test [-- vitest args]: a throw-away MariaDB in .data/test-mariadb/ (wiped every run),
 * then tsc, eslint (when eslint.config.js exists), vitest and, last, the browser tests against
 * a whole app started for them (e2e, scripts/run-e2e.ts), one after the other. The server is
 * always stopped afterwards; the exit code is the first failing step's.
 *
 * Settings: TEST_DB_PORT=8571 (a free port is picked when it is taken).
 *   E2E      unset: the e2e stage runs when no vitest args are given; off: never; on: always
 * Exported to the steps:
 *   TEST_DATABASE_ADMIN_URL  mariadb://root:<pw>@127.0.0.1:<port>/  (tests/helpers/test-db.ts)
 *   TEST_MARIADB_DIR, TEST_MARIADB_DATADIR, TEST_MARIADB_SOCKET, TEST_MARIADB_PORT
 *   TEST_MARIADB_START       JSON options for startMariadb/stopMariadb/killMariadb from
 *                            scripts/lib/mariadb.ts (see mariadbOptionsFromEnv()).
 */
import type { ChildProcess } from 'node:child_process';
import { existsSync, rmSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { MariadbError, bootstrapTcpRoot, mariadbPaths, startMariadb, stopMariadb, type MariadbOptions } from './lib/mariadb.ts';
import { findFreePort, isPortFree, parsePort } from './lib/ports.ts';
import { finisher, onFirstSignal, runInherited, seconds } from './lib/proc.ts';
import { claimScratchDir, type ScratchDir } from './lib/scratch-dir.ts';
import { ensurePrivateDir } from './lib/secrets.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DATA_DIR = path.join(ROOT, '.data');
const vitestArgs = process.argv.slice(2);
/**
 * The browser stage (scripts/run-e2e.ts) runs last on a whole run; E2E=off skips it, E2E=on
 * runs it even when test files or options are named.
 */
const e2eSetting = (process.env.E2E ?? '').toLowerCase();
const runE2e = e2eSetting === 'on' || (e2eSetting === '' && vitestArgs.length === 0);

const say = (line: string) => process.stdout.write(line + '\n');
const fail = (line: string) => process.stderr.write(line + '\n');
process.stdout.on('error', () => {});

let dbOpts: MariadbOptions | undefined;
let scratch: ScratchDir | undefined;
let current: ChildProcess | undefined;
let interrupted: NodeJS.Signals | undefined;
const finish = finisher(async () => {
  if (dbOpts) {
    const t = Date.now();
    await stopMariadb(dbOpts).catch((err) => fail(`Could not stop the test MariaDB: ${(err as Error).message}`));
    say(`Test MariaDB stopped (${seconds(Date.now() - t)})`);
  }
  scratch?.release();
});

onFirstSignal((sig) => {
  interrupted = sig;
  // A terminal Ctrl-C already reached the step (same process group); SIGTERM covers the rest.
  // main() notices `interrupted` after the current step or the server start, then stops MariaDB.
  if (current && current.exitCode === null) current.kill('SIGTERM');
});

function bin(name: string): string[] {
  const local = path.join(ROOT, 'node_modules/.bin', name);
  return existsSync(local) ? [local] : ['npx', name];
}

async function runStep(command: string[], env: NodeJS.ProcessEnv): Promise<number> {
  const step = runInherited(command, { cwd: ROOT, env });
  current = step.child;
  const code = await step.exit;
  current = undefined;
  return code;
}

async function main(): Promise<void> {
  if (!['', 'on', 'off'].includes(e2eSetting)) {
    fail(`E2E=${process.env.E2E} must be on or off`);
    return void (await finish(1));
  }
  // ---- throw-away MariaDB ----------------------------------------------------------------------
  const t = Date.now();
  ensurePrivateDir(DATA_DIR);
  // Temporary folders of runs that died may still have their server running: stop it first.
  scratch = await claimScratchDir(DATA_DIR, 'test-mariadb', (dir) => stopMariadb({ baseDir: dir, port: 0 }), say);
  const baseDir = scratch.dir;
  let port = parsePort('TEST_DB_PORT', process.env.TEST_DB_PORT, 8571);
  const opts: MariadbOptions = { baseDir, port, portSetting: 'TEST_DB_PORT' };
  // A server left by an interrupted run still uses the datadir: stop it before wiping.
  await stopMariadb(opts);
  rmSync(baseDir, { recursive: true, force: true });
  const wanted = port;
  if (!(await isPortFree(port))) port = await findFreePort();
  opts.port = port;
  dbOpts = opts;
  let tries = 0;
  while (true) {
    try {
      await startMariadb(opts);
      break;
    } catch (err) {
      // Another process took the port between the check and the start: pick another one.
      if (err instanceof MariadbError && err.portTaken && ++tries < 3) {
        opts.port = port = await findFreePort();
        continue;
      }
      throw err;
    }
  }
  if (interrupted) return void (await finish(130));
  const { adminUrl } = await bootstrapTcpRoot(opts);
  const paths = mariadbPaths(opts);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    TEST_DATABASE_ADMIN_URL: adminUrl,
    TEST_MARIADB_DIR: baseDir,
    TEST_MARIADB_DATADIR: paths.datadir,
    TEST_MARIADB_SOCKET: paths.socket,
    TEST_MARIADB_PORT: String(port),
    TEST_MARIADB_START: JSON.stringify({ baseDir, port, portSetting: 'TEST_DB_PORT' } satisfies MariadbOptions),
  };
  say(`Test MariaDB ready on 127.0.0.1:${port}${port !== wanted ? ` (${wanted} was taken)` : ''} (${seconds(Date.now() - t)})`);

  // ---- steps ---------------------------------------------------------------------------------
  const steps: [string, string[], NodeJS.ProcessEnv][] = [['tsc', [...bin('tsc'), '--noEmit', '-p', 'tsconfig.json'], env]];
  if (existsSync(path.join(ROOT, 'eslint.config.js'))) steps.push(['eslint', [...bin('eslint'), '.'], env]);
  if (runE2e) {
    // The browser tests run once, in the e2e stage: without E2E_BASE_URL vitest skips them here.
    const withoutE2e = { ...env };
    delete withoutE2e.E2E_BASE_URL;
    steps.push(['vitest', [...bin('vitest'), 'run', ...vitestArgs], withoutE2e]);
    steps.push(['e2e', [process.execPath, '--import', 'tsx', path.join(ROOT, 'scripts/run-e2e.ts')], process.env]);
  } else {
    steps.push(['vitest', [...bin('vitest'), 'run', ...vitestArgs], env]);
  }

  const results: string[] = [];
  let firstFailure = 0;
  for (const [name, command, stepEnv] of steps) {
    if (interrupted) break;
    say(`\n── ${name} ──`);
    const s = Date.now();
    const code = await runStep(command, stepEnv);
    const line = `${name}: ${code === 0 ? 'ok' : `FAILED (exit ${code})`} in ${seconds(Date.now() - s)}`;
    results.push(line);
    say(`── ${line}`);
    if (code !== 0 && firstFailure === 0) firstFailure = code;
  }
  say('');
  for (const r of results) say(r);
  if (!runE2e) say(`e2e: skipped (${e2eSetting === 'off' ? 'E2E=off' : 'test files named; E2E=on runs it too'})`);
  if (interrupted) return void (await finish(130));
  await finish(firstFailure);
}

main().catch((err) => {
  fail(err instanceof MariadbError ? err.message : `npm test failed to start: ${(err as Error).stack ?? err}`);
  void finish(1);
});
