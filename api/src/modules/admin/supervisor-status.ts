import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { supervisorRunFileSchema, type PartState } from '../../../../shared/schemas/ingest-health.ts';

/**
 * The parts' states as the plant supervisor (npm start) last wrote them to its run file in
 * the data folder; null when no supervisor runs this API (a service manager of the site's own,
 * a test) or the file cannot be read.
 */
export async function supervisedParts(dataDir: string): Promise<PartState[] | null> {
  try {
    const raw = JSON.parse(await readFile(path.join(path.resolve(dataDir), 'supervisor.json'), 'utf8')) as unknown;
    const parsed = supervisorRunFileSchema.safeParse(raw);
    return parsed.success ? parsed.data.states : null;
  } catch {
    return null;
  }
}
