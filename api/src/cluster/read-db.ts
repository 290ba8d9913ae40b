import type { Sequelize } from 'sequelize';
import { Site } from '../db/models.ts';
import { createSequelize } from '../db/sequelize.ts';
import { logger } from '../lib/logger.ts';

/**
 * DATABASE_READ_URL: a MariaDB replica for read-only trend queries, which are the heavy
 * reads (days of readings per tank page), so they stop competing with ingest commits on the
 * primary. Replication is asynchronous: a replica may be seconds behind,
 * which a trend tolerates (live values arrive over socket.io) but a decision never does, so
 * nothing else reads from it. A failing replica falls back to the primary, with a log line.
 */
let replica: Sequelize | undefined;
let warnedAt = 0;

export function useReadReplica(sequelize: Sequelize | undefined): void {
  replica = sequelize;
}

/**
 * server.ts: DATABASE_READ_URL → a small pool on the replica (trend pages only), or nothing.
 * Returns the closer for shutdown.
 */
export function connectReadReplica(url: string | undefined): () => Promise<void> {
  if (!url) return async () => undefined;
  const sequelize = createSequelize(url, 5);
  useReadReplica(sequelize);
  logger.info({ replica: url.replace(/\/\/[^@/]*@/, '//***@') }, 'trend queries go to the read replica');
  return async () => {
    useReadReplica(undefined);
    await sequelize.close().catch(() => undefined);
  };
}

/** Runs a read-only query on the replica when there is one, else (or when it fails) on the primary. */
export async function onReadReplica<T>(read: (db: Sequelize) => Promise<T>): Promise<T> {
  const primary = Site.sequelize!;
  if (!replica) return read(primary);
  try {
    return await read(replica);
  } catch (err) {
    const e = err as Error & { name?: string };
    // Only an unreachable replica falls back: a bad query would fail on the primary too.
    if (!/Connection|Timeout|HostNotReachable|AccessDenied/i.test(e.name ?? '')) throw err;
    if (Date.now() - warnedAt > 60_000) {
      warnedAt = Date.now();
      logger.warn({ err: e.message }, 'read replica unavailable; trend queries use the primary');
    }
    return read(primary);
  }
}
