import { spawn, type ChildProcess } from 'node:child_process';
import { createInterface } from 'node:readline';
import type { Readable, Writable } from 'node:stream';

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
}

/**
 * Runs parts as child processes (each in its own process group, so a terminal Ctrl-C reaches
 * only the supervisor, which then stops them in order). A part that exits while the
 * supervisor is not stopping is restarted after 1 s; more than `maxRestarts` restarts within
 * a minute calls onGiveUp.
 */
export class PartSupervisor {
  private parts: Running[] = [];
  private stopping = false;

  constructor(
    private readonly log: (line: string) => void,
    private readonly onGiveUp: (name: string) => void,
    private readonly maxRestarts = 5,
    /** Called after every (re)start, e.g. to record the pids. */
    private readonly onSpawn: () => void = () => {},
  ) {}

  /** Running parts: name → pid. */
  pids(): Record<string, number> {
    const out: Record<string, number> = {};
    for (const r of this.parts) if (r.child?.pid && r.child.exitCode === null) out[r.spec.name] = r.child.pid;
    return out;
  }

  start(spec: PartSpec): void {
    const r: Running = { spec, restarts: [] };
    this.parts.push(r);
    this.launch(r);
  }

  private launch(r: Running): void {
    const [cmd, ...args] = r.spec.command;
    const child = spawn(cmd!, args, { cwd: r.spec.cwd, env: r.spec.env, stdio: ['ignore', 'pipe', 'pipe'], detached: true });
    r.child = child;
    const pre = prefix(r.spec.name);
    pipeLines(child.stdout!, process.stdout, pre);
    pipeLines(child.stderr!, process.stderr, pre);
    this.onSpawn();
    r.exited = new Promise((resolve) => {
      let ended = false;
      const onEnd = (how: string) => {
        if (ended) return;
        ended = true;
        resolve();
        if (r.child !== child) return;
        r.child = undefined;
        if (this.stopping) return;
        const now = Date.now();
        r.restarts = r.restarts.filter((t) => now - t < 60_000);
        if (r.restarts.length >= this.maxRestarts) {
          this.log(`${r.spec.name} exited (${how}) and has been restarted ${this.maxRestarts} times in a minute: giving up`);
          this.onGiveUp(r.spec.name);
          return;
        }
        r.restarts.push(now);
        this.log(`${r.spec.name} exited unexpectedly (${how}); restarting in 1 s`);
        r.restartTimer = setTimeout(() => {
          r.restartTimer = undefined;
          if (!this.stopping) this.launch(r);
        }, 1000);
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
