/**
 * <data folder>/supervisor.json: the running plant supervisor's pid, its port and its parts'
 * pids and states (scripts/run-plant.ts writes it; the API shows the states in Plant setup). Used to refuse a second supervisor on the same data
 * folder, and to clean up after a supervisor that was killed before it could stop its parts.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { PartState } from '../../shared/schemas/ingest-health.ts';
import { pidAlive, waitForExit } from './proc.ts';

export type RunFile = { pid?: number; port?: number; parts?: Record<string, number>; states?: PartState[] };

export const runFilePath = (dataDir: string) => path.join(dataDir, 'supervisor.json');

export function readRunFile(dataDir: string): RunFile {
  try {
    return JSON.parse(readFileSync(runFilePath(dataDir), 'utf8')) as RunFile;
  } catch {
    return {};
  }
}

export function cmdline(pid: number): string {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').replace(/\0/g, ' ');
  } catch {
    return '';
  }
}

/** The pid of the supervisor still running on this data folder (not `self`), if any. */
export function liveSupervisor(run: RunFile, self = process.pid): number | undefined {
  return run.pid && run.pid !== self && pidAlive(run.pid) && cmdline(run.pid).includes('run-plant.ts') ? run.pid : undefined;
}

/** Stops a process group: SIGTERM, then SIGKILL after timeoutMs. */
async function stopGroup(pids: number[], timeoutMs: number): Promise<void> {
  const signal = (pid: number, sig: NodeJS.Signals) => {
    try {
      process.kill(-pid, sig);
    } catch {
      /* gone */
    }
  };
  for (const pid of pids) signal(pid, 'SIGTERM');
  const until = Date.now() + timeoutMs;
  for (const pid of pids) if (!(await waitForExit(pid, Math.max(0, until - Date.now())))) signal(pid, 'SIGKILL');
}

/**
 * Stops the parts a killed supervisor left running (each runs in its own process group).
 * @returns how many there were
 */
export async function stopLeftoverParts(run: RunFile, timeoutMs = 10_000): Promise<number> {
  const leftovers = Object.values(run.parts ?? {}).filter((pid) => pidAlive(pid) && / --import tsx |^redis-server /.test(cmdline(pid)));
  await stopGroup(leftovers, timeoutMs);
  return leftovers.length;
}
