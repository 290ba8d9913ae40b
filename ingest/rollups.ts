import { toSqlTs, type PoolConnection } from './db.ts';

const MINUTE_MS = 60_000;
const HOUR_MS = 3_600_000;

/** A run of consecutive buckets of one probe: [fromMs, toMs). */
type Span = { probeId: number; fromMs: number; toMs: number };

/** Distinct (probe, bucket) pairs merged into contiguous spans, so a sparse backfill scans only what it touched. */
export function bucketSpans(points: { probeId: number; tsMs: number }[], bucketMs: number): Span[] {
  const byProbe = new Map<number, Set<number>>();
  for (const p of points) {
    const start = Math.floor(p.tsMs / bucketMs) * bucketMs;
    let set = byProbe.get(p.probeId);
    if (!set) byProbe.set(p.probeId, (set = new Set()));
    set.add(start);
  }
  const spans: Span[] = [];
  for (const [probeId, starts] of byProbe) {
    const sorted = [...starts].sort((a, b) => a - b);
    let span: Span | null = null;
    for (const s of sorted) {
      if (span && span.toMs === s) span.toMs = s + bucketMs;
      else spans.push((span = { probeId, fromMs: s, toMs: s + bucketMs }));
    }
  }
  return spans;
}

function spanWhere(spans: Span[], column: string): { sql: string; params: (number | string)[] } {
  const params: (number | string)[] = [];
  const parts = spans.map((s) => {
    params.push(s.probeId, toSqlTs(s.fromMs), toSqlTs(s.toMs));
    return `(probe_id = ? AND ${column} >= ? AND ${column} < ?)`;
  });
  return { sql: parts.join(' OR '), params };
}

const COLUMNS = 'probe_id, bucket, n, orp_min, orp_max, orp_mean, eh_min, eh_max, eh_mean, temp_min, temp_max, temp_mean, log_ratio_mean, log_ratio_min, log_ratio_max';
const UPDATE_ALL = COLUMNS.split(', ').slice(2).map((c) => `${c} = VALUES(${c})`).join(', ');

/**
 * Recomputes every touched minute from raw readings, then every touched hour from the
 * minute table (≤ 60 rows per probe-hour instead of up to 3 600 raw rows). Recomputing,
 * rather than adding increments, keeps both tables exact with late and backfilled data.
 * Run inside the same transaction as the insert.
 */
export async function recomputeRollups(conn: PoolConnection, points: { probeId: number; tsMs: number }[]): Promise<void> {
  if (points.length === 0) return;
  const CHUNK = 500;
  const minutes = bucketSpans(points, MINUTE_MS);
  for (let i = 0; i < minutes.length; i += CHUNK) {
    const w = spanWhere(minutes.slice(i, i + CHUNK), 'ts');
    await conn.query(
      `INSERT INTO rollups_1m (${COLUMNS})
       SELECT probe_id, DATE_FORMAT(ts, '%Y-%m-%d %H:%i:00') AS b, COUNT(*),
              MIN(orp_mv), MAX(orp_mv), AVG(orp_mv), MIN(eh_v), MAX(eh_v), AVG(eh_v),
              MIN(temp_c), MAX(temp_c), AVG(temp_c), AVG(LOG10(ratio)), LOG10(MIN(ratio)), LOG10(MAX(ratio))
         FROM readings WHERE ${w.sql} GROUP BY probe_id, b
       ON DUPLICATE KEY UPDATE ${UPDATE_ALL}`,
      w.params,
    );
  }
  const hours = bucketSpans(points, HOUR_MS);
  for (let i = 0; i < hours.length; i += CHUNK) {
    const w = spanWhere(hours.slice(i, i + CHUNK), 'bucket');
    await conn.query(
      `INSERT INTO rollups_1h (${COLUMNS})
       SELECT probe_id, DATE_FORMAT(bucket, '%Y-%m-%d %H:00:00') AS b, SUM(n),
              MIN(orp_min), MAX(orp_max), SUM(orp_mean * n) / SUM(n), MIN(eh_min), MAX(eh_max), SUM(eh_mean * n) / SUM(n),
              MIN(temp_min), MAX(temp_max), SUM(temp_mean * n) / SUM(n),
              SUM(log_ratio_mean * n) / SUM(n), MIN(log_ratio_min), MAX(log_ratio_max)
         FROM rollups_1m WHERE ${w.sql} GROUP BY probe_id, b
       ON DUPLICATE KEY UPDATE ${UPDATE_ALL}`,
      w.params,
    );
  }
}
