import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { recomputeRollups } from '../readings/rollups.repository.ts';
import type { PoolConnection } from '../../db/pool.ts';
import { toSqlTs } from '../../db/timestamps.ts';
import { orpToRatio } from '../../../../shared/redox/index.ts';
import { AppError } from '../../lib/app-error.ts';
import type { ProbeRef } from './calibration.repository.ts';

type Cal = { version: number; formalPotentialV: number; formalCoeffVPerK: number };
type Reading = { probe_id: number; ts: string; orp_mv: number; temp_c: number };

const PAGE = 5000;
const MINUTE_MS = 60_000;

/**
 * Re-converts a tank's stored readings in [from, to) with one calibration version, inside the
 * caller's transaction. Rows are locked page by page (FOR UPDATE) before being rewritten, so
 * the retention purge cannot delete one in between and the upsert never inserts a new row.
 * The 1 m / 1 h rollups are rebuilt with the ingest worker's own code, so both stay identical.
 */
export async function recomputeReadings(
  sequelize: Sequelize, transaction: Transaction, probes: ProbeRef[], cal: Cal, fromMs: number, toMs: number,
): Promise<number> {
  let updated = 0;
  for (const probe of probes) {
    let after = toSqlTs(fromMs);
    let afterInclusive = false;
    for (;;) {
      const rows = await sequelize.query<Reading>(
        `SELECT probe_id, DATE_FORMAT(ts, '%Y-%m-%d %H:%i:%s.%f') AS ts, orp_mv, temp_c FROM readings
          WHERE probe_id = ? AND ts ${afterInclusive ? '>' : '>='} ? AND ts < ? ORDER BY ts LIMIT ${PAGE} FOR UPDATE`,
        { replacements: [probe.id, after, toSqlTs(toMs)], type: QueryTypes.SELECT, transaction },
      );
      if (rows.length === 0) break;
      const values: unknown[] = [];
      for (const r of rows) {
        let out: ReturnType<typeof orpToRatio>;
        try {
          out = orpToRatio({ orpMv: r.orp_mv, tempC: r.temp_c, reference: probe.reference, formalPotentialV: cal.formalPotentialV, formalCoeffVPerK: cal.formalCoeffVPerK });
        } catch (err) {
          throw AppError.badRequest(`Reading of ${probe.tag} at ${r.ts} cannot be converted: ${(err as Error).message}. Nothing was changed.`);
        }
        values.push(r.probe_id, r.ts, r.orp_mv, r.temp_c, out.ehV, out.ratio, out.ferricFraction, out.flag, cal.version);
      }
      await sequelize.query(
        `INSERT INTO readings (probe_id, ts, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at)
         VALUES ${rows.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?, NOW(3))').join(', ')}
         ON DUPLICATE KEY UPDATE eh_v = VALUES(eh_v), ratio = VALUES(ratio), ferric_fraction = VALUES(ferric_fraction),
                                 flag = VALUES(flag), calibration_version = VALUES(calibration_version)`,
        { replacements: values, transaction },
      );
      updated += rows.length;
      after = rows[rows.length - 1].ts;
      afterInclusive = true;
      if (rows.length < PAGE) break;
    }
  }
  // One point per minute is enough for the rollup code to find every touched bucket.
  const points: { probeId: number; tsMs: number }[] = [];
  for (const probe of probes) {
    for (let t = Math.floor(fromMs / MINUTE_MS) * MINUTE_MS; t < toMs; t += MINUTE_MS) points.push({ probeId: probe.id, tsMs: t });
  }
  const conn = {
    query: (sql: string, params?: unknown[]) => sequelize.query(sql, { replacements: params, transaction }),
  } as unknown as PoolConnection;
  if (updated > 0) await recomputeRollups(conn, points);
  return updated;
}
