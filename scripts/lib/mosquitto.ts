import { spawn } from 'node:child_process';
import { chmodSync, mkdirSync, writeFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { findExecutable, pidAlive, runCommand, sleep, waitForExit } from './proc.ts';

/**
 * A private mosquitto 2 (Debian's package, installed by scripts/ensure-deps.sh when the
 * external-broker tests or bench:scale run) on loopback, with its own config, password file
 * and ACL: what a site's own broker looks like to Ferrisight. Used by the shared-subscription
 * test and `npm run bench:scale`; never by `npm start`, which keeps the embedded broker.
 */
export type MosquittoUser = {
  username: string;
  password: string;
  /** Topic filters this user may publish to; '#' for the service account. */
  write: string[];
  /** Topic filters this user may subscribe to and receive. */
  read: string[];
};

export type RunningMosquitto = { port: number; pid: number; url: string; logFile: string; stop: () => Promise<void> };

export function mosquittoBinaries(): { broker: string; passwd: string } {
  const broker = findExecutable('mosquitto');
  const passwd = findExecutable('mosquitto_passwd');
  if (!broker || !passwd) throw new Error('mosquitto is not installed: run FERRISIGHT_MOSQUITTO=1 bash scripts/ensure-deps.sh test (as root)');
  return { broker, passwd };
}

/** Writes dir/{mosquitto.conf,passwords,acl} (mode 600) for a broker on 127.0.0.1:port. */
export async function prepareMosquitto(dir: string, port: number, users: MosquittoUser[]): Promise<{ conf: string; logFile: string }> {
  const bins = mosquittoBinaries();
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  chmodSync(dir, 0o700);
  const passwords = path.join(dir, 'passwords');
  const acl = path.join(dir, 'acl');
  const conf = path.join(dir, 'mosquitto.conf');
  const logFile = path.join(dir, 'mosquitto.log');
  writeFileSync(passwords, '', { mode: 0o600 });
  // -b takes the password on argv, but only for the moment the hash is written, in a private dir.
  for (const u of users) {
    const r = await runCommand(bins.passwd, ['-b', passwords, u.username, u.password], { cwd: dir });
    if (r.code !== 0) throw new Error(`mosquitto_passwd failed for ${u.username}: ${r.stderr}`);
  }
  const aclText = users.flatMap((u) => [
    `user ${u.username}`,
    ...u.write.map((t) => `topic write ${t}`),
    ...u.read.map((t) => `topic read ${t}`),
    '',
  ]).join('\n');
  writeFileSync(acl, aclText, { mode: 0o600 });
  writeFileSync(conf, [
    'per_listener_settings false',
    // As root mosquitto would switch to its own user, which cannot read this private directory.
    ...(process.getuid?.() === 0 ? ['user root'] : []),
    `listener ${port} 127.0.0.1`,
    'allow_anonymous false',
    `password_file ${passwords}`,
    `acl_file ${acl}`,
    // Sessions stay in memory: the broker is not what these runs kill.
    'persistence false',
    // A worker acknowledges after its commit: let it have many messages in flight, and queue
    // a dead worker's share until it is back rather than dropping it at the default 1,000.
    'max_inflight_messages 1000',
    'max_queued_messages 1000000',
    // The device contract's 256 KiB payload plus the topic and header.
    'max_packet_size 263168',
    `log_dest file ${logFile}`,
    'log_type error',
    'log_type warning',
    '',
  ].join('\n'), { mode: 0o600 });
  return { conf, logFile };
}

/** Starts mosquitto as a child of this process; resolves once it accepts TCP connections. */
export async function startMosquitto(dir: string, port: number, users: MosquittoUser[]): Promise<RunningMosquitto> {
  const { conf, logFile } = await prepareMosquitto(dir, port, users);
  const child = spawn(mosquittoBinaries().broker, ['-c', conf], { stdio: 'ignore', detached: true });
  child.unref();
  const pid = child.pid!;
  const until = Date.now() + 15_000;
  while (!(await listening(port))) {
    if (!pidAlive(pid) || Date.now() > until) {
      if (pidAlive(pid)) process.kill(pid, 'SIGKILL');
      throw new Error(`mosquitto did not listen on ${port} (see ${logFile})`);
    }
    await sleep(50);
  }
  return {
    port, pid, logFile, url: `mqtt://127.0.0.1:${port}`,
    async stop() {
      if (!pidAlive(pid)) return;
      process.kill(pid, 'SIGTERM');
      if (!(await waitForExit(pid, 5_000)) && pidAlive(pid)) process.kill(pid, 'SIGKILL');
    },
  };
}

function listening(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect(port, '127.0.0.1');
    s.once('connect', () => { s.destroy(); resolve(true); });
    s.once('error', () => { s.destroy(); resolve(false); });
  });
}
