/**
 * A MariaDB server of one test's own, for kill -9. The shared test server (TEST_MARIADB_START)
 * cannot be killed: vitest runs other files against it at the same time. This one lives next
 * to it (`<test dir>-fault-<pid>`), with the same settings, and is removed afterwards.
 */
import { rmSync } from 'node:fs';
import { createMigrator, createSequelize } from '../../../api/src/db/sequelize.ts';
import {
  bootstrapTcpRoot, killMariadb, mariadbOptionsFromEnv, mariadbPid, startMariadb, stopMariadb, type MariadbOptions,
} from '../../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../../scripts/lib/ports.ts';

export type PrivateDb = {
  databaseUrl: string;
  opts: MariadbOptions;
  pid(): number | undefined;
  kill(): Promise<void>;
  start(): Promise<void>;
  stop(): Promise<void>;
};

export async function startPrivateDb(name = 'fault'): Promise<PrivateDb> {
  const shared = mariadbOptionsFromEnv();
  const opts: MariadbOptions = { ...shared, baseDir: `${shared.baseDir}-${name}-${process.pid}`, port: await findFreePort(), bufferPool: '128M' };
  rmSync(opts.baseDir, { recursive: true, force: true });
  await startMariadb(opts);
  const { adminUrl: databaseUrl } = await bootstrapTcpRoot(opts, 'ferrisight_fault');
  const seq = createSequelize(databaseUrl, 2);
  try {
    await createMigrator(seq).up();
  } finally {
    await seq.close();
  }
  return {
    databaseUrl, opts,
    pid: () => mariadbPid(opts),
    kill: () => killMariadb(opts),
    async start() {
      await startMariadb(opts);
    },
    async stop() {
      // RELIABILITY_KEEP_DB=1 leaves the server running for a post-mortem.
      if (process.env.RELIABILITY_KEEP_DB === '1') return void console.log(`kept: ${databaseUrl} (${opts.baseDir})`);
      await stopMariadb(opts).catch(() => undefined);
      rmSync(opts.baseDir, { recursive: true, force: true });
    },
  };
}
