import { createAdapter } from '@socket.io/redis-streams-adapter';
import type { Logger } from 'pino';
import { createClient } from 'redis';
import type { ServerOptions } from 'socket.io';
import { logger as rootLogger } from '../lib/logger.ts';

/** socket.io packets older than this cannot be recovered; alarms still replay by id from the database. */
export const MAX_DISCONNECTION_MS = 2 * 60_000;

/**
 * Several API nodes behind one address (REDIS_URL set; unset = one node, no Redis).
 *
 * - Adapter: Redis Streams (@socket.io/redis-streams-adapter), the adapter that supports
 *   connection-state recovery (Redis pub/sub does not, per socket.io's docs): a broadcast made on
 *   any node goes through one stream and reaches the sockets of every node, and a client that
 *   reconnects to another node gets the packets it missed from the stream.
 * - Transport: websocket only. A socket.io session then lives on one TCP connection, so any
 *   round-robin balancer works without sticky sessions; HTTP long-polling would need them (its
 *   requests may land on different nodes). The web client already tries websocket first.
 * - Middlewares run again on a recovered connection (skipMiddlewares: false), so a session
 *   revoked or expired meanwhile is still refused.
 */
export type SocketCluster = { options: Partial<ServerOptions>; close: () => Promise<void> };

export async function connectSocketCluster(redisUrl: string, log: Logger = rootLogger): Promise<SocketCluster> {
  const clog = log.child({ component: 'socket-cluster' });
  const client = createClient({
    url: redisUrl,
    // Keep retrying: the adapter resumes its stream where it stopped once Redis is back.
    socket: { reconnectStrategy: (retries) => Math.min(250 * 2 ** retries, 5_000), connectTimeout: 5_000 },
  });
  let lastError = '';
  client.on('error', (err: Error) => {
    // Logged once per distinct error: a Redis outage must not flood the log.
    if (err.message !== lastError) clog.warn({ err: err.message }, 'redis error');
    lastError = err.message;
  });
  client.on('ready', () => {
    if (lastError) clog.info('redis connection restored');
    lastError = '';
  });
  await client.connect();
  clog.info({ redis: redisUrl.replace(/\/\/[^@/]*@/, '//***@') }, 'socket.io cluster adapter on redis streams');
  return {
    options: {
      adapter: createAdapter(client, { streamName: 'ferrisight:socket.io', sessionKeyPrefix: 'ferrisight:sio:session:', maxLen: 10_000 }),
      transports: ['websocket'],
      connectionStateRecovery: { maxDisconnectionDuration: MAX_DISCONNECTION_MS, skipMiddlewares: false },
    },
    async close() {
      // The adapter's blocking XREAD runs on a duplicate of this client; close() ends both.
      await client.close().catch(() => undefined);
    },
  };
}
