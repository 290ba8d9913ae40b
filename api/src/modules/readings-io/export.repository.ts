import type { Readable } from 'node:stream';
import type { ExportSource } from '../../../../shared/schemas/export.ts';
import { Site } from '../../db/models.ts';
import { rawPool } from '../../db/database.ts';
import type { PoolConnection } from '../../db/pool.ts';
import { toSqlTs } from '../../db/timestamps.ts';

export type ExportProbe = { probeId: number; probeTag: string; tankId: number; tankTag: string };

const pool = () => rawPool(Site.sequelize!);

/**
 * Rows as arrays in the CSV column order. Ordered by probe then time so MariaDB walks the
 * primary key (probe_id, ts) range by range and never sorts the whole result.
 */
const SQL: Record<ExportSource, string> = {
  raw: `SELECT probe_id, ts, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version
          FROM readings WHERE probe_id IN (?) AND ts >= ? AND ts < ? ORDER BY probe_id, ts`,
  '1m': rollupSql('rollups_1m'),
  '1h': rollupSql('rollups_1h'),
};

function rollupSql(table: string): string {
  return `SELECT probe_id, bucket, n, orp_mean, orp_min, orp_max, eh_mean, eh_min, eh_max, temp_mean, temp_min, temp_max,
                 POW(10, log_ratio_mean), POW(10, log_ratio_min), POW(10, log_ratio_max)
            FROM ${table} WHERE probe_id IN (?) AND bucket >= ? AND bucket < ? ORDER BY probe_id, bucket`;
}

export const exportRepository = {
  /** Every probe the tanks ever had (a replaced probe's history belongs to the tank). */
  async probes(tankIds: number[]): Promise<ExportProbe[]> {
    return pool().query(
      `SELECT p.id AS probeId, p.tag AS probeTag, t.id AS tankId, t.tag AS tankTag
         FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.id IN (?) ORDER BY t.id, p.id`, [tankIds]);
  },

  /** A dedicated connection and a row stream on it; the caller releases (or destroys, on abort) the connection. */
  async open(source: ExportSource, probeIds: number[], fromMs: number, toMs: number): Promise<{ conn: PoolConnection; rows: Readable }> {
    const conn = await pool().getConnection();
    const rows = conn.queryStream({ sql: SQL[source], rowsAsArray: true }, [probeIds, toSqlTs(fromMs), toSqlTs(toMs)]);
    return { conn, rows };
  },
};
