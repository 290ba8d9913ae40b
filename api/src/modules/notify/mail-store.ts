import { randomBytes } from 'node:crypto';
import { mkdir, readdir, readFile, rename, writeFile } from 'node:fs/promises';
import path from 'node:path';

/**
 * Mail caught by the local SMTP catcher: one JSON file per message in FERRISIGHT_DATA_DIR/mail/, named
 * so that a plain sort is arrival order. Written by simulators/mail-catcher.ts, read by the
 * admin route (the API and the catcher are separate processes; the folder is their contract).
 */
export type CaughtMail = {
  id: string;
  receivedAt: string;
  envelope: { from: string | null; to: string[] };
  messageId: string | null;
  from: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  headers: Record<string, string>;
};

export async function saveCaughtMail(dir: string, mail: Omit<CaughtMail, 'id'>): Promise<CaughtMail> {
  await mkdir(dir, { recursive: true, mode: 0o700 });
  const id = `${Date.now().toString().padStart(15, '0')}-${randomBytes(4).toString('hex')}`;
  const full: CaughtMail = { id, ...mail };
  // Write then rename: a reader never sees half a file.
  const tmp = path.join(dir, `.${id}.tmp`);
  await writeFile(tmp, JSON.stringify(full), { mode: 0o600 });
  await rename(tmp, path.join(dir, `${id}.json`));
  return full;
}

/** Newest first; a missing folder means nothing was caught yet. */
export async function listCaughtMail(dir: string, limit = 100): Promise<CaughtMail[]> {
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => /^\d{15}-[0-9a-f]{8}\.json$/.test(n));
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return [];
    throw err;
  }
  const newest = names.sort().reverse().slice(0, limit);
  const out: CaughtMail[] = [];
  for (const n of newest) {
    try {
      out.push(JSON.parse(await readFile(path.join(dir, n), 'utf8')) as CaughtMail);
    } catch {
      // A file removed or damaged by hand is skipped, not fatal for the page.
    }
  }
  return out;
}
