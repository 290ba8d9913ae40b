/**
 * The real entry points as child processes (ingest/broker.ts, ingest/worker.ts), so SIGKILL
 * means what it means on a plant: no finally blocks, no graceful PUBACKs, sockets torn down by
 * the kernel. Each child is tracked and killed by its own pid at the end of a test.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createInterface } from 'node:readline';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
export const SERVICE_PASSWORD = 'reliability-service-password-0123';

const live = new Set<ChildProcess>();

export type Child = { proc: ChildProcess; pid: number; exited: Promise<number | null>; lines: string[] };

/** Spawns `node --import tsx <file>`; stdout/stderr lines are kept (last 2,000) for failure messages and log checks. */
export function spawnPart(file: string, env: NodeJS.ProcessEnv): Child {
  const proc = spawn(process.execPath, ['--import', 'tsx', file], {
    cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'],
    env: { ...process.env, NODE_ENV: 'test', LOG_LEVEL: process.env.RELIABILITY_LOG_LEVEL ?? 'warn', ...env },
  });
  live.add(proc);
  const lines: string[] = [];
  for (const s of [proc.stdout!, proc.stderr!]) {
    createInterface({ input: s }).on('line', (l) => {
      lines.push(l);
      if (lines.length > 2000) lines.shift();
      if (process.env.RELIABILITY_DEBUG) process.stderr.write(`[${path.basename(file)} ${proc.pid}] ${l}\n`);
    });
  }
  const exited = new Promise<number | null>((resolve) => proc.once('exit', (code) => {
    live.delete(proc);
    resolve(code);
  }));
  return { proc, pid: proc.pid!, exited, lines };
}

/** SIGKILL by pid and wait for the exit. */
export async function kill9(child: Child): Promise<void> {
  if (child.proc.exitCode === null && child.proc.signalCode === null) child.proc.kill('SIGKILL');
  await child.exited;
}

/** End of a test: every child this module started and that still runs, by its own pid. */
export async function killAll(): Promise<void> {
  await Promise.all([...live].map((p) => {
    const done = new Promise((r) => p.once('exit', r));
    p.kill('SIGKILL');
    return done;
  }));
}

export function waitForPort(port: number, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  return new Promise((resolve, reject) => {
    const attempt = () => {
      const s = net.connect(port, '127.0.0.1');
      s.once('connect', () => { s.destroy(); resolve(); });
      s.once('error', () => {
        s.destroy();
        if (Date.now() > deadline) reject(new Error(`nothing listened on ${port} within ${timeoutMs} ms`));
        else setTimeout(attempt, 50);
      });
    };
    attempt();
  });
}

export type BrokerEnv = { port: number; dataDir: string; databaseUrl: string; extra?: NodeJS.ProcessEnv };

/** ingest/broker.ts on a fixed port with its level store in dataDir/broker; resolves once it listens. */
export async function startBrokerProcess(o: BrokerEnv): Promise<Child> {
  const child = spawnPart('ingest/broker.ts', {
    MQTT_PORT: String(o.port), FERRISIGHT_DATA_DIR: o.dataDir, DATABASE_URL: o.databaseUrl, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD, FERRISIGHT_PROC: 'broker',
    // The load generators open hundreds of connections with one device login.
    MQTT_MAX_CONNECTIONS_PER_GATEWAY: '1000',
    ...o.extra,
  });
  await Promise.race([
    waitForPort(o.port),
    child.exited.then((code) => { throw new Error(`broker exited (${code}) before listening:\n${child.lines.join('\n')}`); }),
  ]);
  return child;
}

export type WorkerEnv = { mqttPort: number; databaseUrl: string; clientId: string; extra?: NodeJS.ProcessEnv };

/** ingest/worker.ts with a fixed client id (its clean: false session is what survives a kill). */
export function startWorkerProcess(o: WorkerEnv): Child {
  return spawnPart('ingest/worker.ts', {
    DATABASE_URL: o.databaseUrl, MQTT_URL: `mqtt://127.0.0.1:${o.mqttPort}`, SERVICE_MQTT_PASSWORD: SERVICE_PASSWORD,
    INGEST_CLIENT_ID: o.clientId, FERRISIGHT_PROC: 'ingest', ...o.extra,
  });
}

export const sleep = (ms: number) => new Promise<void>((r) => setTimeout(r, ms));

/** Resident set of a pid from /proc, MiB: `rss` now (VmRSS), `peak` so far (VmHWM); null when it is gone. */
export function rssMiB(pid: number): { rss: number; peak: number } | null {
  try {
    const status = readFileSync(`/proc/${pid}/status`, 'utf8');
    const kb = (key: string) => Number(new RegExp(`${key}:\\s+(\\d+) kB`).exec(status)?.[1] ?? NaN) / 1024;
    return { rss: kb('VmRSS'), peak: kb('VmHWM') };
  } catch {
    return null;
  }
}
