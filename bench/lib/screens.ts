/**
 * Screens for the fan-out benchmark: socket.io clients signed in as users of every role, each
 * watching what its screen shows (one site's Floor, or every site on the overview) and recording,
 * for each tank update, how long after its commit it arrived.
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { io, type Socket } from 'socket.io-client';
import type { Role } from '../../shared/schemas/auth.ts';
import type { ClientToServerEvents, ServerToClientEvents } from '../../shared/schemas/socket-events.ts';

export type Screen = { socket: Socket<ServerToClientEvents, ClientToServerEvents>; sites: number; latencies: number[]; updates: number; reset(): void; close(): void };

/** The sites screen i watches: every fifth screen is a site overview (all sites), the rest one site's Floor. */
export function viewOf(i: number, siteTags: string[]): string[] {
  return i % 5 === 4 ? siteTags : [siteTags[i % siteTags.length]!];
}

/**
 * `committedAt` maps `probeTag|ts` to when the ingest worker announced the reading as stored (its
 * internal latest message, sent right after the commit): a screen's latency is counted from there.
 */
export async function connectScreens(ports: number[], n: number, tokens: { role: Role; token: string }[], siteTags: string[], committedAt: Map<string, number>): Promise<Screen[]> {
  const screens: Screen[] = [];
  const ready: Promise<void>[] = [];
  for (let i = 0; i < n; i += 1) {
    const socket: Socket<ServerToClientEvents, ClientToServerEvents> = io(`http://127.0.0.1:${ports[i % ports.length]}`, { transports: ['websocket'], auth: { token: tokens[i % tokens.length]!.token }, timeout: 20_000 });
    const view = viewOf(i, siteTags);
    const screen: Screen = {
      socket, sites: view.length, latencies: [], updates: 0,
      reset() {
        this.latencies = [];
        this.updates = 0;
      },
      close: () => socket.close(),
    };
    socket.on('tank:latest', (readings) => {
      const now = Date.now();
      screen.updates += readings.length;
      for (const r of readings) {
        const at = committedAt.get(`${r.probeTag}|${r.ts}`);
        if (at !== undefined) screen.latencies.push(now - at);
      }
    });
    ready.push(new Promise((resolve, reject) => {
      socket.once('connect', () => {
        socket.emit('live:watch', { sites: view });
        resolve();
      });
      socket.once('connect_error', (err) => reject(new Error(`screen ${i}: ${err.message}`)));
    }));
    screens.push(screen);
    // Screens arrive over a few seconds, as browsers do, not in one instant.
    if (i % 50 === 49) await Promise.all(ready);
  }
  await Promise.all(ready);
  return screens;
}

/**
 * `count` screens in a child process that is then stopped (SIGSTOP): connected, watching every
 * site, never reading, like a backgrounded tab or a phone that lost its radio.
 */
export async function pausedScreens(ports: number[], count: number, token: string, siteTags: string[]): Promise<{ close(): void }> {
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(path.dirname(fileURLToPath(import.meta.url)), 'paused-screens.ts')], {
    stdio: ['ignore', 'pipe', 'inherit'],
    env: { ...process.env, PAUSED_PORTS: ports.join(','), PAUSED_COUNT: String(count), PAUSED_TOKEN: token, PAUSED_SITES: siteTags.join(',') },
  });
  await new Promise<void>((resolve, reject) => {
    child.stdout!.setEncoding('utf8').on('data', (d: string) => {
      if (d.includes('ready')) resolve();
    });
    child.once('exit', (code) => reject(new Error(`paused screens exited (${code})`)));
  });
  child.kill('SIGSTOP');
  return {
    close() {
      child.kill('SIGCONT');
      child.kill('SIGKILL');
    },
  };
}
