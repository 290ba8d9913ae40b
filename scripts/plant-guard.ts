/**
 * Started by the plant supervisor (scripts/run-plant.ts) beside its parts: if the supervisor
 * dies without stopping them (SIGKILL, an out-of-memory kill), this stops what it left behind,
 * parts first, then the private MariaDB, so nothing runs on as an orphan. A supervisor that
 * stops normally removes its run file first, and this then simply exits.
 *   node --import tsx scripts/plant-guard.ts '{"supervisorPid":…,"dataDir":…,"db":{…}|null}'
 */
import { existsSync, rmSync } from 'node:fs';
import { stopMariadb, type MariadbOptions } from './lib/mariadb.ts';
import { pidAlive, sleep } from './lib/proc.ts';
import { readRunFile, runFilePath, stopLeftoverParts } from './lib/run-file.ts';

const { supervisorPid, dataDir, db } = JSON.parse(process.argv[2] ?? '{}') as { supervisorPid: number; dataDir: string; db: MariadbOptions | null };

async function main(): Promise<void> {
  while (pidAlive(supervisorPid)) await sleep(250);
  if (!existsSync(runFilePath(dataDir))) return; // stopped normally
  // Parts also notice on their own (scripts/lib/parent-watch.ts); this catches any that hang.
  await stopLeftoverParts(readRunFile(dataDir), 6_000);
  if (db) await stopMariadb({ ...db, stopTimeoutMs: 3_000 }).catch(() => {});
  rmSync(runFilePath(dataDir), { force: true });
}

for (const sig of ['SIGINT', 'SIGHUP'] as const) process.on(sig, () => {});
void main().finally(() => process.exit(0));
