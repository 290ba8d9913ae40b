import type { Readable } from 'node:stream';
import type { ImportJobStatus, ImportJobView } from '../../../../shared/schemas/import.ts';
import { fromSqlTs, placeholders, type PoolConnection } from '../../db/pool.ts';
import { Site } from '../../db/models.ts';
import { rawPool } from '../../db/database.ts';
import type { Rejection } from './import-rows.ts';

type JobRow = {
  id: number; file_name: string; file_bytes: number; status: ImportJobStatus; bytes_read: number; rows_read: number;
  stored: number; duplicates: number; conflicts: number; rejected: number; error: string | null; created_by: number;
  created_at: string; started_at: string | null; finished_at: string | null; updated_at: string;
};

export type JobProgress = Pick<ImportJobView, 'bytesRead' | 'rowsRead' | 'stored' | 'duplicates' | 'conflicts' | 'rejected'>;

const pool = () => rawPool(Site.sequelize!);
const iso = (s: string | null) => (s ? new Date(fromSqlTs(s)).toISOString() : null);

function toView(r: JobRow): ImportJobView & { updatedAtMs: number } {
  return {
    id: r.id, fileName: r.file_name, fileBytes: r.file_bytes, status: r.status, bytesRead: r.bytes_read, rowsRead: r.rows_read,
    stored: r.stored, duplicates: r.duplicates, conflicts: r.conflicts, rejected: r.rejected, error: r.error,
    createdBy: r.created_by, createdAt: iso(r.created_at)!, startedAt: iso(r.started_at), finishedAt: iso(r.finished_at),
    updatedAtMs: fromSqlTs(r.updated_at),
  };
}

export const importRepository = {
  async create(fileName: string, fileBytes: number, userId: number): Promise<number> {
    const res: { insertId: number } = await pool().query(
      `INSERT INTO import_jobs (file_name, file_bytes, status, created_by, created_at, updated_at)
       VALUES (?, ?, 'queued', ?, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))`, [fileName.slice(0, 255), fileBytes, userId]);
    return Number(res.insertId);
  },

  async get(id: number): Promise<(ImportJobView & { updatedAtMs: number }) | null> {
    const rows: JobRow[] = await pool().query('SELECT * FROM import_jobs WHERE id = ?', [id]);
    return rows[0] ? toView(rows[0]) : null;
  },

  async list(limit: number): Promise<ImportJobView[]> {
    const rows: JobRow[] = await pool().query('SELECT * FROM import_jobs ORDER BY id DESC LIMIT ?', [limit]);
    return rows.map(toView);
  },

  async start(id: number): Promise<void> {
    await pool().query(`UPDATE import_jobs SET status = 'running', started_at = UTC_TIMESTAMP(3), updated_at = UTC_TIMESTAMP(3) WHERE id = ?`, [id]);
  },

  async progress(id: number, p: JobProgress): Promise<void> {
    await pool().query(
      `UPDATE import_jobs SET bytes_read = ?, rows_read = ?, stored = ?, duplicates = ?, conflicts = ?, rejected = ?, updated_at = UTC_TIMESTAMP(3)
        WHERE id = ?`, [p.bytesRead, p.rowsRead, p.stored, p.duplicates, p.conflicts, p.rejected, id]);
  },

  async finish(id: number, status: 'done' | 'failed', error: string | null): Promise<void> {
    await pool().query(
      `UPDATE import_jobs SET status = ?, error = ?, finished_at = UTC_TIMESTAMP(3), updated_at = UTC_TIMESTAMP(3) WHERE id = ?`,
      [status, error?.slice(0, 1000) ?? null, id]);
  },

  async addRejections(jobId: number, rows: Rejection[]): Promise<void> {
    for (let i = 0; i < rows.length; i += 1000) {
      const chunk = rows.slice(i, i + 1000);
      await pool().query(`INSERT INTO import_rejections (job_id, line, reason, content) VALUES ${placeholders(chunk.length, 4)}`,
        chunk.flatMap((r) => [jobId, r.line, r.reason, r.content]));
    }
  },

  /** Rejected rows in line order, streamed: a bad file can have as many as it has lines. */
  async openRejections(jobId: number): Promise<{ conn: PoolConnection; rows: Readable }> {
    const conn = await pool().getConnection();
    return { conn, rows: conn.queryStream({ sql: 'SELECT line, reason, content FROM import_rejections WHERE job_id = ? ORDER BY line, id', rowsAsArray: true }, [jobId]) };
  },
};
