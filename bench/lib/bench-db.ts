/**
 * A private MariaDB for benchmarks in .data/bench-mariadb/ (wiped per run), with the schema
 * migrated: the same server settings as npm start, so figures mean what the plant will see.
 */
import { rmSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createMigrator, createSequelize } from '../../api/src/db/sequelize.ts';
import { bootstrapTcpRoot, startMariadb, stopMariadb, type MariadbOptions } from '../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export type BenchDb = { databaseUrl: string; opts: MariadbOptions; stop(): Promise<void> };

export async function startBenchDb(bufferPool = '512M'): Promise<BenchDb> {
  const baseDir = path.join(ROOT, '.data', 'bench-mariadb');
  await stopMariadb({ baseDir, port: 0 }).catch(() => {});
  rmSync(baseDir, { recursive: true, force: true });
  const opts: MariadbOptions = { baseDir, port: await findFreePort(), bufferPool, portSetting: 'BENCH_DB_PORT' };
  await startMariadb(opts);
  const { adminUrl: databaseUrl } = await bootstrapTcpRoot(opts, 'ferrisight_bench');
  const seq = createSequelize(databaseUrl, 2);
  await createMigrator(seq).up();
  await seq.close();
  return {
    databaseUrl, opts,
    async stop() {
      await stopMariadb(opts);
      rmSync(baseDir, { recursive: true, force: true });
    },
  };
}

export const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

export const quantile = (xs: number[], q: number) => {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
};
