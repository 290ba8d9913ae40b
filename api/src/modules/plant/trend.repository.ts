import { QueryTypes, type Sequelize } from 'sequelize';
import type { TrendResponse } from '../../../../shared/schemas/plant.ts';
import { toSqlTs } from '../../db/timestamps.ts';

export type TrendSource = 'raw' | '1m' | '1h';

/**
 * Picks the coarsest table that still gives at least `maxPoints` buckets of width
 * span/maxPoints, so a 30-day range never touches the raw table.
 */
export function planTrend(spanS: number, maxPoints: number, intervalS: number): { source: TrendSource; bucketS: number } {
  const bucketS = Math.max(1, Math.ceil(spanS / maxPoints));
  if (bucketS >= 3600) return { source: '1h', bucketS };
  if (bucketS >= 60) return { source: '1m', bucketS };
  return { source: 'raw', bucketS: spanS / intervalS <= maxPoints ? 0 : bucketS };
}

type Row = { t: number; lr: number; lrmin: number; lrmax: number; orp: number; temp: number };

/** Trend columns for one probe, at most maxPoints rows. */
export async function queryTrend(
  sequelize: Sequelize, probeId: number, from: Date, to: Date, maxPoints: number, intervalS: number,
): Promise<Omit<TrendResponse, 'tankId'>> {
  const spanS = (to.getTime() - from.getTime()) / 1000;
  const { source, bucketS } = planTrend(spanS, maxPoints, intervalS);
  const replacements = { probeId, from: toSqlTs(from.getTime()), to: toSqlTs(to.getTime()), b: bucketS };
  let sql: string;
  if (source === 'raw' && bucketS === 0) {
    sql = `SELECT UNIX_TIMESTAMP(ts) AS t, LOG10(ratio) AS lr, LOG10(ratio) AS lrmin, LOG10(ratio) AS lrmax, orp_mv AS orp, temp_c AS temp
             FROM readings WHERE probe_id = :probeId AND ts >= :from AND ts < :to ORDER BY ts`;
  } else if (source === 'raw') {
    sql = `SELECT FLOOR(UNIX_TIMESTAMP(ts) / :b) * :b AS t, AVG(LOG10(ratio)) AS lr, MIN(LOG10(ratio)) AS lrmin, MAX(LOG10(ratio)) AS lrmax,
                  AVG(orp_mv) AS orp, AVG(temp_c) AS temp
             FROM readings WHERE probe_id = :probeId AND ts >= :from AND ts < :to GROUP BY 1 ORDER BY 1`;
  } else {
    const table = source === '1m' ? 'rollups_1m' : 'rollups_1h';
    sql = `SELECT FLOOR(UNIX_TIMESTAMP(bucket) / :b) * :b AS t, SUM(log_ratio_mean * n) / SUM(n) AS lr, MIN(log_ratio_min) AS lrmin,
                  MAX(log_ratio_max) AS lrmax, SUM(orp_mean * n) / SUM(n) AS orp, SUM(temp_mean * n) / SUM(n) AS temp
             FROM ${table} WHERE probe_id = :probeId AND bucket >= :from AND bucket < :to GROUP BY 1 ORDER BY 1`;
  }
  const rows = await sequelize.query<Row>(sql, { replacements, type: QueryTypes.SELECT });
  const col = <K extends keyof Row>(k: K, f = (v: number) => v) => rows.map((r) => f(Number(r[k])));
  const pow = (v: number) => 10 ** v;
  return {
    resolution: source, from: from.toISOString(), to: to.toISOString(),
    t: col('t'), ratio: col('lr', pow), ratioMin: col('lrmin', pow), ratioMax: col('lrmax', pow), orpMv: col('orp'), tempC: col('temp'),
  };
}
