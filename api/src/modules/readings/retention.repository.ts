import type { Logger } from 'pino';
import { toSqlTs, type Pool } from '../../db/pool.ts';

const HOUR_MS = 3_600_000;
const CHUNK_ROWS = 5_000;

/**
 * Raw-reading cutoff for a retention window. Floored to the hour so every hour that can
 * still receive late data (ts ≥ now − window) keeps all its raw rows, and recomputed
 * rollups of that hour stay exact.
 */
export function retentionCutoffMs(nowMs: number, retentionDays: number): number {
  return Math.floor((nowMs - retentionDays * 86_400_000) / HOUR_MS) * HOUR_MS;
}

/**
 * Deletes raw readings older than the window, per probe and in small chunks: the primary
 * key (probe_id, ts) makes each chunk a short range delete, and short transactions keep
 * the ingest flushes from waiting on locks. Rollups are kept.
 * @returns rows deleted
 */
export async function deleteExpiredReadings(pool: Pool, retentionDays: number, log: Logger, nowMs = Date.now()): Promise<number> {
  const cutoff = toSqlTs(retentionCutoffMs(nowMs, retentionDays));
  // Loose index scan on the primary key prefix: cheap even on a large table.
  const probes: { probe_id: number }[] = await pool.query('SELECT DISTINCT probe_id FROM readings');
  let total = 0;
  for (const { probe_id: probeId } of probes) {
    for (;;) {
      const res: { affectedRows: number } = await pool.query(
        'DELETE FROM readings WHERE probe_id = ? AND ts < ? ORDER BY ts LIMIT ?', [probeId, cutoff, CHUNK_ROWS]);
      total += res.affectedRows;
      if (res.affectedRows < CHUNK_ROWS) break;
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
  if (total > 0) log.info({ deleted: total, cutoff }, 'raw readings past retention deleted');
  return total;
}

/**
 * Deletes dead letters and conflicts received more than retentionDays ago, in chunks on the
 * received_at index (both tables are kept for inspection, not as the record).
 * @returns rows deleted from each table
 */
export async function deleteExpiredRefusals(
  pool: Pool, retentionDays: number, log: Logger, nowMs = Date.now(),
): Promise<{ deadLetters: number; conflicts: number }> {
  const cutoff = toSqlTs(nowMs - retentionDays * 86_400_000);
  const out = { deadLetters: 0, conflicts: 0 };
  for (const [table, key] of [['dead_letters', 'deadLetters'], ['reading_conflicts', 'conflicts']] as const) {
    for (;;) {
      const res: { affectedRows: number } = await pool.query(
        `DELETE FROM ${table} WHERE received_at < ? ORDER BY received_at LIMIT ?`, [cutoff, CHUNK_ROWS]);
      out[key] += res.affectedRows;
      if (res.affectedRows < CHUNK_ROWS) break;
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
  if (out.deadLetters + out.conflicts > 0) log.info({ ...out, cutoff }, 'dead letters and conflicts past retention deleted');
  return out;
}
