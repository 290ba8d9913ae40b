import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { chmodSync, mkdirSync, writeFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { findExecutable, pidAlive, sleep, waitForExit } from './proc.ts';

/**
 * A private redis-server on loopback (Debian's redis-server 7.0, installed by
 * scripts/ensure-deps.sh cluster) for `npm run start:cluster`, the scale test and the
 * scale benchmark. It only carries socket.io traffic between API nodes, which is transient,
 * so nothing is written to disk; a password keeps other local users out.
 */
export type RedisPaths = { dir: string; conf: string; log: string };

export function redisPaths(dir: string): RedisPaths {
  return { dir, conf: path.join(dir, 'redis.conf'), log: path.join(dir, 'redis.log') };
}

/** Writes dir/redis.conf (mode 600) and returns the command that runs it in the foreground and the URL. */
export function prepareRedis(dir: string, port: number, password = randomBytes(18).toString('base64url')): { command: string[]; url: string } {
  const bin = findExecutable('redis-server');
  if (!bin) throw new Error('redis-server is not installed: run bash scripts/ensure-deps.sh cluster (as root)');
  const p = redisPaths(dir);
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  chmodSync(dir, 0o700);
  // The password lives in the config file rather than argv, which any local user can read in /proc.
  const conf = [
    `port ${port}`, 'bind 127.0.0.1', 'protected-mode yes', `requirepass ${password}`, `dir ${dir}`,
    'save ""', 'appendonly no', 'daemonize no', `logfile ${p.log}`, 'maxmemory 256mb', 'maxmemory-policy noeviction',
  ].join('\n');
  writeFileSync(p.conf, conf + '\n', { mode: 0o600 });
  chmodSync(p.conf, 0o600);
  return { command: [bin, p.conf], url: `redis://:${password}@127.0.0.1:${port}` };
}

/** Resolves once the server answers PING with the password (polls every 100 ms). */
export async function waitForRedis(url: string, timeoutMs = 15_000): Promise<void> {
  const u = new URL(url);
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await ping(Number(u.port), decodeURIComponent(u.password))) return;
    await sleep(100);
  }
  throw new Error(`redis-server did not answer on ${u.host} within ${timeoutMs / 1000} s`);
}

function ping(port: number, password: string): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect(port, '127.0.0.1');
    let buf = '';
    const done = (ok: boolean) => {
      s.destroy();
      resolve(ok);
    };
    s.setTimeout(1000, () => done(false));
    s.on('error', () => done(false));
    s.on('connect', () => s.write(`AUTH ${password}\r\nPING\r\n`));
    s.on('data', (d) => {
      buf += d.toString('utf8');
      if (buf.includes('+PONG')) done(true);
      else if (buf.includes('-')) done(false);
    });
  });
}

/** Starts redis-server as a child of this process (tests, benchmark); stop() ends it by its pid. */
export async function startRedis(dir: string, port: number): Promise<{ url: string; pid: number; stop: () => Promise<void> }> {
  const { command, url } = prepareRedis(dir, port);
  const child = spawn(command[0]!, command.slice(1), { stdio: 'ignore', detached: true });
  child.unref();
  const pid = child.pid!;
  try {
    await waitForRedis(url);
  } catch (err) {
    if (pidAlive(pid)) process.kill(pid, 'SIGKILL');
    throw err;
  }
  return {
    url,
    pid,
    async stop() {
      if (!pidAlive(pid)) return;
      process.kill(pid, 'SIGTERM');
      if (!(await waitForExit(pid, 5_000)) && pidAlive(pid)) process.kill(pid, 'SIGKILL');
    },
  };
}
