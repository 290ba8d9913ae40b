/**
 * Dashboard stand-ins for the scale test and benchmark: socket.io clients signed in as a test
 * user, websocket only (what cluster mode serves), recording each alarm event id with the time
 * it arrived, so a test can ask "did every client on every node get every alarm, and how late".
 */
import { io, type Socket } from 'socket.io-client';
import type { Pool } from '../../../api/src/db/pool.ts';
import { issueToken } from '../../../api/src/modules/auth/tokens.ts';
import { JWT_SECRET } from './cluster.ts';

/** A supervisor account and a session token for it, straight into the database. */
export async function watcherToken(pool: Pool, email = 'scale-watcher@test.example'): Promise<string> {
  const now = '2026-01-01 00:00:00.000';
  await pool.query(
    `INSERT INTO users (email, name, role, password_hash, disabled, tokens_valid_after, created_at, updated_at)
     VALUES (?, 'Scale watcher', 'supervisor', 'x', 0, '1970-01-01 00:00:01', ?, ?) ON DUPLICATE KEY UPDATE name = name`, [email, now, now]);
  const [row] = (await pool.query('SELECT id FROM users WHERE email = ?', [email])) as { id: number }[];
  return issueToken({ id: row!.id, role: 'supervisor' }, JWT_SECRET, 3600);
}

export type Watcher = {
  socket: Socket;
  node: number;
  /** alarm event id → arrival time (performance.now()), first arrival only. */
  alarms: Map<number, number>;
  /** Arrivals beyond the first per id (the feed may replay; clients drop ids they have). */
  repeats: number;
};

export async function connectWatchers(ports: number[], perNode: number, token: string): Promise<Watcher[]> {
  const out: Watcher[] = [];
  const ready: Promise<void>[] = [];
  ports.forEach((port, node) => {
    for (let i = 0; i < perNode; i += 1) {
      const socket = io(`http://127.0.0.1:${port}`, { transports: ['websocket'], auth: { token }, reconnectionDelay: 200, timeout: 20_000 });
      const w: Watcher = { socket, node, alarms: new Map(), repeats: 0 };
      socket.on('alarm:event', (e: { id: number }) => {
        if (w.alarms.has(e.id)) w.repeats += 1;
        else w.alarms.set(e.id, performance.now());
      });
      ready.push(new Promise((resolve, reject) => {
        socket.once('connect', () => resolve());
        socket.once('connect_error', (err) => reject(new Error(`socket to ${port}: ${err.message}`)));
      }));
      out.push(w);
    }
  });
  await Promise.all(ready);
  return out;
}

export function closeWatchers(ws: Watcher[]): void {
  for (const w of ws) w.socket.close();
}

/** Ids some watcher has not received (empty when everyone has everything). */
export function missing(ws: Watcher[], ids: number[]): string[] {
  const out: string[] = [];
  for (const [i, w] of ws.entries()) {
    const lacking = ids.filter((id) => !w.alarms.has(id));
    if (lacking.length) out.push(`watcher ${i} on node ${w.node + 1} lacks ${lacking.length}: ${lacking.slice(0, 5).join(', ')}`);
  }
  return out;
}
