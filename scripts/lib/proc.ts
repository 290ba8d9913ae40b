import { spawn, type ChildProcess, type SpawnOptions } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';

export interface RunResult {
  code: number | null;
  signal: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

/** Runs a command to completion, collecting its output (never throws for a non-zero exit). */
export function runCommand(
  cmd: string,
  args: string[],
  opts: { cwd?: string; env?: NodeJS.ProcessEnv; input?: string; timeoutMs?: number } = {},
): Promise<RunResult> {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, {
      cwd: opts.cwd,
      env: opts.env ?? process.env,
      stdio: ['pipe', 'pipe', 'pipe'],
    } satisfies SpawnOptions);
    let stdout = '';
    let stderr = '';
    child.stdout!.setEncoding('utf8').on('data', (d: string) => (stdout += d));
    child.stderr!.setEncoding('utf8').on('data', (d: string) => (stderr += d));
    child.stdin!.on('error', () => {});
    child.stdin!.end(opts.input ?? '');
    let timer: NodeJS.Timeout | undefined;
    if (opts.timeoutMs) timer = setTimeout(() => child.kill('SIGKILL'), opts.timeoutMs);
    child.on('error', (err) => {
      if (timer) clearTimeout(timer);
      resolve({ code: 127, signal: null, stdout, stderr: stderr + String(err) });
    });
    child.on('close', (code, signal) => {
      if (timer) clearTimeout(timer);
      resolve({ code, signal, stdout, stderr });
    });
  });
}

/**
 * Starts a step whose output goes straight to ours. `exit` resolves to its exit code: 130
 * after SIGINT, 143 after another signal, 127 when it could not start.
 */
export function runInherited(command: string[], opts: { cwd: string; env: NodeJS.ProcessEnv }): { child: ChildProcess; exit: Promise<number> } {
  const [cmd, ...args] = command;
  const child = spawn(cmd!, args, { cwd: opts.cwd, env: opts.env, stdio: ['ignore', 'inherit', 'inherit'] });
  const exit = new Promise<number>((resolve) => {
    child.on('error', (err) => {
      process.stderr.write(`${String(err)}\n`);
      resolve(127);
    });
    child.on('exit', (code, signal) => resolve(code ?? (signal === 'SIGINT' ? 130 : 128 + 15)));
  });
  return { child, exit };
}

/** Calls `handler` on the first SIGINT, SIGTERM or SIGHUP; later ones are ignored. */
export function onFirstSignal(handler: (sig: NodeJS.Signals) => void): void {
  let seen = false;
  for (const sig of ['SIGINT', 'SIGTERM', 'SIGHUP'] as const) {
    process.on(sig, () => {
      if (seen) return;
      seen = true;
      handler(sig);
    });
  }
}

/**
 * A `finish(code)` for a script: the first call runs `cleanUp` once and exits with its code;
 * later calls (an interrupt during the clean-up) wait for that exit.
 */
export function finisher(cleanUp: () => Promise<void>): (code: number) => Promise<never> {
  let finishing = false;
  return async (code) => {
    if (!finishing) {
      finishing = true;
      await cleanUp();
      process.exit(code);
    }
    return new Promise<never>(() => {});
  };
}

/** True while the process exists and is not a zombie. */
export function pidAlive(pid: number): boolean {
  if (!Number.isInteger(pid) || pid <= 0) return false;
  try {
    process.kill(pid, 0);
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const state = stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
    if (state === 'Z' || state === 'X') return false;
  } catch {
    /* no /proc: trust kill(0) */
  }
  return true;
}

export async function waitForExit(pid: number, timeoutMs: number): Promise<boolean> {
  const until = Date.now() + timeoutMs;
  while (pidAlive(pid)) {
    if (Date.now() > until) return false;
    await sleep(50);
  }
  return true;
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** Finds an executable on PATH, also looking in the sbin folders (mariadbd lives in /usr/sbin). */
export function findExecutable(name: string): string | undefined {
  const dirs = [...(process.env.PATH ?? '').split(':'), '/usr/local/sbin', '/usr/local/bin', '/usr/sbin', '/usr/bin', '/sbin', '/bin'];
  for (const d of dirs) {
    if (!d) continue;
    const p = path.join(d, name);
    if (existsSync(p)) return p;
  }
  return undefined;
}

/** Seconds with one decimal, for progress lines. */
export function seconds(ms: number): string {
  return `${(ms / 1000).toFixed(1)} s`;
}
