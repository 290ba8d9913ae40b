import { placeholders, toSqlTs, type PoolConnection } from '../../db/pool.ts';

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

/** What addToRollups needs of a newly inserted reading. */
export type RollupPoint = { probeId: number; tsMs: number; orpMv: number; ehV: number; tempC: number; ratio: number };

type BucketSum = {
  probeId: number; bucketMs: number; n: number;
  orpMin: number; orpMax: number; orpSum: number; ehMin: number; ehMax: number; ehSum: number;
  tempMin: number; tempMax: number; tempSum: number; logSum: number; logMin: number; logMax: number;
};

/** Aggregates of the given points per (probe, bucket), in memory. Exported for tests. */
export function aggregateBuckets(points: RollupPoint[], bucketMs: number): BucketSum[] {
  // Per probe, then per bucket start: numeric keys, no string built per reading.
  const byProbe = new Map<number, Map<number, BucketSum>>();
  const out: BucketSum[] = [];
  for (const p of points) {
    const start = Math.floor(p.tsMs / bucketMs) * bucketMs;
    let buckets = byProbe.get(p.probeId);
    if (!buckets) byProbe.set(p.probeId, (buckets = new Map()));
    const lg = Math.log10(p.ratio);
    const a = buckets.get(start);
    if (!a) {
      const fresh: BucketSum = {
        probeId: p.probeId, bucketMs: start, n: 1,
        orpMin: p.orpMv, orpMax: p.orpMv, orpSum: p.orpMv, ehMin: p.ehV, ehMax: p.ehV, ehSum: p.ehV,
        tempMin: p.tempC, tempMax: p.tempC, tempSum: p.tempC, logSum: lg, logMin: lg, logMax: lg,
      };
      buckets.set(start, fresh);
      out.push(fresh);
      continue;
    }
    a.n += 1;
    a.orpMin = Math.min(a.orpMin, p.orpMv); a.orpMax = Math.max(a.orpMax, p.orpMv); a.orpSum += p.orpMv;
    a.ehMin = Math.min(a.ehMin, p.ehV); a.ehMax = Math.max(a.ehMax, p.ehV); a.ehSum += p.ehV;
    a.tempMin = Math.min(a.tempMin, p.tempC); a.tempMax = Math.max(a.tempMax, p.tempC); a.tempSum += p.tempC;
    a.logSum += lg; a.logMin = Math.min(a.logMin, lg); a.logMax = Math.max(a.logMax, lg);
  }
  return out;
}

/*
 * Merge of a stored bucket with the new rows' partial aggregate. MariaDB evaluates the
 * assignments left to right and later ones see earlier results, so the means (weighted by the
 * old n) come first and n is updated last.
 */
const mean = (c: string) => `${c} = (${c} * n + VALUES(${c}) * VALUES(n)) / (n + VALUES(n))`;
const MERGE = [
  'orp_min = LEAST(orp_min, VALUES(orp_min))', 'orp_max = GREATEST(orp_max, VALUES(orp_max))', mean('orp_mean'),
  'eh_min = LEAST(eh_min, VALUES(eh_min))', 'eh_max = GREATEST(eh_max, VALUES(eh_max))', mean('eh_mean'),
  'temp_min = LEAST(temp_min, VALUES(temp_min))', 'temp_max = GREATEST(temp_max, VALUES(temp_max))', mean('temp_mean'),
  mean('log_ratio_mean'), 'log_ratio_min = LEAST(log_ratio_min, VALUES(log_ratio_min))', 'log_ratio_max = GREATEST(log_ratio_max, VALUES(log_ratio_max))',
  'n = n + VALUES(n)',
].join(', ');

/**
 * Adds newly inserted readings to their 1 m and 1 h rollups without reading raw rows back:
 * each touched bucket gets one upsert that merges count, min, max and mean. Exact for late
 * and backfilled data too, because storeReadings only passes rows it has just inserted (keys
 * proven absent under lock) and runs this in the same transaction. Values that change stored
 * readings (a recalibration) use recomputeRollups instead.
 */
export async function addToRollups(conn: PoolConnection, points: RollupPoint[]): Promise<void> {
  if (points.length === 0) return;
  const CHUNK = 1000;
  for (const [table, bucketMs] of [['rollups_1m', MINUTE_MS], ['rollups_1h', HOUR_MS]] as const) {
    // One lock order for every flush (probe, then bucket), so concurrent flushes wait rather than deadlock.
    const parts = aggregateBuckets(points, bucketMs).sort((x, y) => x.probeId - y.probeId || x.bucketMs - y.bucketMs);
    for (let i = 0; i < parts.length; i += CHUNK) {
      const rows = parts.slice(i, i + CHUNK);
      const params = rows.flatMap((a) => [
        a.probeId, toSqlTs(a.bucketMs), a.n, a.orpMin, a.orpMax, a.orpSum / a.n, a.ehMin, a.ehMax, a.ehSum / a.n,
        a.tempMin, a.tempMax, a.tempSum / a.n, a.logSum / a.n, a.logMin, a.logMax,
      ]);
      await conn.execute(`INSERT INTO ${table} (${COLUMNS}) VALUES ${placeholders(rows.length, 15)} ON DUPLICATE KEY UPDATE ${MERGE}`, params);
    }
  }
}
