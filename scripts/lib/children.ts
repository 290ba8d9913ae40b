import { spawn, type ChildProcess } from 'node:child_process';
import { createInterface } from 'node:readline';
import type { Readable, Writable } from 'node:stream';
import type { PartState } from '../../shared/schemas/ingest-health.ts';

export type { PartState };

const useColour = Boolean(process.stdout.isTTY) && !process.env.NO_COLOR;
const COLOURS: Record<string, number> = { broker: 35, mail: 34, api: 32, ingest: 33, sim: 36, web: 95, migrate: 90, seed: 90, vite: 90, redis: 31, lb: 32 };
export const NAME_WIDTH = 7;

/** "api    │ " in the part's colour. */
export function prefix(name: string): string {
  const label = `${name.padEnd(NAME_WIDTH)}│ `;
  // Cluster copies (api1, ingest2, …) take their part's colour.
  const c = COLOURS[name] ?? COLOURS[name.replace(/\d+$/, '')] ?? 37;
  return useColour ? `\x1b[${c}m${label}\x1b[0m` : label;
}

/** Copies a stream to `out` line by line, each line prefixed. */
export function pipeLines(from: Readable, out: Writable, pre: string): void {
  const rl = createInterface({ input: from, crlfDelay: Infinity });
  rl.on('line', (line) => out.write(pre + line + '\n'));
}

export interface PartSpec {
  name: string;
  /** Command and arguments, e.g. [process.execPath, '--import', 'tsx', 'api/src/server.ts']. */
  command: string[];
  env: NodeJS.ProcessEnv;
  cwd: string;
}

interface Running {
  spec: PartSpec;
  child?: ChildProcess;
  exited?: Promise<void>;
  restarts: number[];
  restartTimer?: NodeJS.Timeout;
  /** Crashes in a row without a stable run in between: sets the back-off. */
  streak: number;
  startedAt: number;
  state: PartState;
}

/**
 * Pause before restart n of a streak: 1 s for the first 20 (a part that crashes now and then is
 * back at once), then 2, 4, 8, 16 and 30 s from then on, so a part that cannot start
 * (its database gone, a bad setting) keeps being tried without flooding the log.
 */
export function restartDelayMs(streak: number): number {
  const QUICK = 20;
  return streak <= QUICK ? 1000 : Math.min(30_000, 1000 * 2 ** (streak - QUICK));
}
/** A part that ran this long before exiting starts a new streak. */
const STABLE_MS = 60_000;

/**
 * Runs parts as child processes (each in its own process group, so a terminal Ctrl-C reaches
 * only the supervisor, which then stops them in order). A part that exits while the
 * supervisor is not stopping is restarted after a back-off that grows while it keeps
 * crashing, without limit: one broken part never takes the others down with it.
 */
export class PartSupervisor {
  private parts: Running[] = [];
  private stopping = false;

  constructor(
    private readonly log: (line: string) => void,
    /** Called after every (re)start and exit, e.g. to record pids and states. */
    private readonly onChange: () => void = () => {},
  ) {}

  /** Running parts: name → pid. */
  pids(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const r of this.parts) if (r.child?.pid && r.child.exitCode === null) out[r.spec.name] = r.child.pid;
    return out;
  }

  states(): PartState[] {
    const hourAgo = Date.now() - 3_600_000;
    return this.parts.map((r) => ({ ...r.state, restartsLastHour: r.restarts.filter((t) => t > hourAgo).length }));
  }

  start(spec: PartSpec): void {
    const now = new Date().toISOString();
    const r: Running = {
      spec, restarts: [], streak: 0, startedAt: Date.now(),
      state: { name: spec.name, state: 'running', pid: null, restarts: 0, restartsLastHour: 0, lastExit: null, exitsInRow: 0, nextStartAt: null, since: now },
    };
    this.parts.push(r);
    this.launch(r);
  }

  private launch(r: Running): void {
    const [cmd, ...args] = r.spec.command;
    const child = spawn(cmd!, args, { cwd: r.spec.cwd, env: r.spec.env, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
    r.child = child;
    r.startedAt = Date.now();
    Object.assign(r.state, { state: 'running', pid: child.pid ?? null, nextStartAt: null, since: new Date().toISOString() });
    const pre = prefix(r.spec.name);
    pipeLines(child.stdout!, process.stdout, pre);
    pipeLines(child.stderr!, process.stderr, pre);
    this.onChange();
    r.exited = new Promise((resolve) => {
      let ended = false;
      const onEnd = (how: string) => {
        if (ended) return;
        ended = true;
        resolve();
        if (r.child !== child) return;
        r.child = undefined;
        const now = Date.now();
        r.state.lastExit = { at: new Date(now).toISOString(), how };
        r.state.pid = null;
        if (this.stopping) {
          r.state.state = 'stopped';
          return;
        }
        r.streak = now - r.startedAt >= STABLE_MS ? 1 : r.streak + 1;
        r.restarts = r.restarts.filter((t) => now - t < 3_600_000);
        r.restarts.push(now);
        r.state.restarts += 1;
        r.state.exitsInRow = r.streak;
        const delay = restartDelayMs(r.streak);
        Object.assign(r.state, { state: 'restarting', nextStartAt: new Date(now + delay).toISOString(), since: new Date(now).toISOString() });
        this.log(`${r.spec.name} exited unexpectedly (${how}); restarting in ${delay / 1000} s${r.streak > 1 ? ` (${r.streak} exits in a row)` : ''}`);
        this.onChange();
        r.restartTimer = setTimeout(() => {
          r.restartTimer = undefined;
          if (!this.stopping) this.launch(r);
        }, delay);
      };
      child.on('error', (err) => onEnd(`could not start: ${err.message}`));
      child.on('exit', (code, signal) => onEnd(signal ? `signal ${signal}` : `code ${code}`));
    });
  }

  /** SIGTERM each part in reverse start order, SIGKILL after `graceMs`, waiting for each. */
  async stopAll(graceMs = 10_000): Promise<void> {
    this.stopping = true;
    for (const r of [...this.parts].reverse()) {
      if (r.restartTimer) clearTimeout(r.restartTimer);
      r.state.state = 'stopped';
      // Recorded before it goes, so a watcher reading the run file sees a stop, not a silent part.
      this.onChange();
      const child = r.child;
      if (!child || child.exitCode !== null || child.signalCode !== null) continue;
      killGroup(child, 'SIGTERM');
      const done = await Promise.race([r.exited!.then(() => true), sleep(graceMs).then(() => false)]);
      if (!done) {
        this.log(`${r.spec.name} did not stop within ${graceMs / 1000} s: killing it`);
        killGroup(child, 'SIGKILL');
        await Promise.race([r.exited, sleep(2000)]);
      } else {
        killGroup(child, 'SIGKILL'); // leftovers of its process group, if any
      }
    }
  }
}

function killGroup(child: ChildProcess, sig: NodeJS.Signals): void {
  if (!child.pid) return;
  try {
    process.kill(-child.pid, sig);
  } catch {
    try {
      child.kill(sig);
    } catch {
      /* gone */
    }
  }
}

const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));
