import fs from 'node:fs/promises';
import type { Readable } from 'node:stream';
import type { ImportJobView } from '../../../../shared/schemas/import.ts';
import type { PoolConnection } from '../../db/pool.ts';
import { Site } from '../../db/models.ts';
import { rawPool } from '../../db/database.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import { writeAudit } from '../audit.repository.ts';
import { importRepository } from './import.repository.ts';
import { runImport } from './import.runner.ts';

/** A job not touched for this long and not known to this process died with an earlier one. */
const STALE_MS = 120_000;
/** Jobs of this process: one runs at a time, so an import never starves the live ingest of connections. */
const mine = new Set<number>();
let tail: Promise<void> = Promise.resolve();

async function run(jobId: number, filePath: string, fileName: string, retentionDays: number): Promise<void> {
  const started = performance.now();
  try {
    await importRepository.start(jobId);
    const p = await runImport(jobId, filePath, { pool: rawPool(Site.sequelize!), retentionDays, source: `import:${jobId}:${fileName}` });
    await importRepository.finish(jobId, 'done', null);
    const s = (performance.now() - started) / 1000;
    logger.info({ jobId, ...p, seconds: Math.round(s * 10) / 10, rowsPerS: Math.round(p.rowsRead / s) }, 'historical import done');
  } catch (err) {
    logger.warn({ jobId, err: (err as Error).message }, 'historical import failed');
    await importRepository.finish(jobId, 'failed', (err as Error).message).catch(() => undefined);
  } finally {
    mine.delete(jobId);
    await fs.rm(filePath, { force: true });
  }
}

export type UploadedFile = { path: string; originalname: string; size: number };

export const importService = {
  /** Records the job and queues it; the caller polls the job for progress. */
  async submit(file: UploadedFile, userId: number, retentionDays: number): Promise<ImportJobView> {
    const jobId = await importRepository.create(file.originalname, file.size, userId);
    await writeAudit({ userId, action: 'readings.import', entity: 'import-job', entityId: jobId, after: { fileName: file.originalname, bytes: file.size } });
    mine.add(jobId);
    tail = tail.then(() => run(jobId, file.path, file.originalname, retentionDays));
    return (await importService.get(jobId))!;
  },

  /** Settles when every queued job of this process has finished (tests, shutdown). */
  idle: () => tail,

  async get(id: number): Promise<ImportJobView | null> {
    const job = await importRepository.get(id);
    if (!job) return null;
    const { updatedAtMs, ...view } = job;
    if ((view.status === 'queued' || view.status === 'running') && !mine.has(id) && Date.now() - updatedAtMs > STALE_MS) {
      const error = 'Interrupted by a restart of the server; upload the file again (what was stored stays, nothing is doubled)';
      await importRepository.finish(id, 'failed', error);
      return { ...view, status: 'failed', error };
    }
    return view;
  },

  list: (limit = 20) => importRepository.list(limit),

  async rejections(id: number): Promise<{ conn: PoolConnection; rows: Readable }> {
    if (!(await importRepository.get(id))) throw AppError.notFound('Import job');
    return importRepository.openRejections(id);
  },
};
