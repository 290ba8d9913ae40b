/**
 * A throw-away folder under .data/ for one test run (npm test's MariaDB, the browser stage's
 * whole app): `<name>/` normally; while another live run in this checkout holds it (its pid is
 * in `<name>.lock`), `<name>-<pid>/`, which is temporary and removed by release().
 */
import { readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { pidAlive } from './proc.ts';

export type ScratchDir = {
  dir: string;
  /** True for `<name>-<pid>/`: release() removes it. */
  temporary: boolean;
  /** Gives the folder up: removes the lock, or the whole temporary folder. */
  release(): void;
};

/**
 * Claims the folder. Temporary folders of runs that died are first handed to `cleanUp` (to stop
 * what still runs there) and removed. The caller cleans and wipes the folder it gets.
 */
export async function claimScratchDir(dataDir: string, name: string, cleanUp: (dir: string) => Promise<void>, say: (line: string) => void): Promise<ScratchDir> {
  for (const e of readdirSync(dataDir)) {
    const m = new RegExp(`^${name}-(\\d+)$`).exec(e);
    if (m && !pidAlive(Number(m[1]))) {
      const dir = path.join(dataDir, e);
      await cleanUp(dir);
      rmSync(dir, { recursive: true, force: true });
    }
  }
  const lockFile = path.join(dataDir, `${name}.lock`);
  for (let attempt = 0; attempt < 2; attempt++) {
    try {
      writeFileSync(lockFile, String(process.pid), { flag: 'wx' });
      return { dir: path.join(dataDir, name), temporary: false, release: () => rmSync(lockFile, { force: true }) };
    } catch {
      const holder = Number(readFileSync(lockFile, 'utf8').trim() || 0);
      if (holder && pidAlive(holder) && holder !== process.pid) {
        const dir = path.join(dataDir, `${name}-${process.pid}`);
        say(`Another npm test (pid ${holder}) uses .data/${name}: this run uses ${path.relative(path.dirname(dataDir), dir)}`);
        return { dir, temporary: true, release: () => rmSync(dir, { recursive: true, force: true }) };
      }
      rmSync(lockFile, { force: true }); // left by a run that died
    }
  }
  throw new Error(`could not claim ${lockFile}`);
}
