/**
 * Sent vs stored for a numbered stream: row count, per-probe seq gaps and duplicates, and the
 * order-independent BIT_XOR(CRC32(CONCAT_WS(',', probe_id, seq, ts, orp_mv))) checksum next to
 * the generator's own. XOR alone cannot see a reading stored twice (x ^ x = 0), which is why
 * the distinct-seq and count checks come with it.
 */
import type { Pool } from 'mariadb';
import type { Expected } from './stream.ts';

export type Comparison = {
  sent: number;
  stored: number;
  /** Expected seqs with no row. */
  lost: number;
  /** Rows beyond one per (probe, seq). */
  duplicated: number;
  /** Rows whose seq the generator never sent for that probe. */
  unexpected: number;
  conflicts: number;
  checksumSent: string;
  checksumStored: string;
  ok: boolean;
  /** First few missing "probeId:seq", for the failure message. */
  missing: string[];
};

/** A stream's seqs lie in (seqAbove, seqAbove + SEQ_SPAN]: streams on the same probes start a span apart. */
export const SEQ_SPAN = 1_000_000;

type ProbeRow = { probe_id: number; n: number; distinct_seq: number; lo: number | null; hi: number | null; in_range: number };

const hex = (n: number) => (n >>> 0).toString(16).padStart(8, '0');

export async function compareStored(pool: Pool, expected: Expected): Promise<Comparison> {
  const ids = [...expected.perProbe.keys()];
  if (ids.length === 0) throw new Error('nothing was sent');
  const inList = ids.map(() => '?').join(', ');
  const [sum] = await pool.query<{ n: number; x: number; m: number }[]>(
    `SELECT COUNT(*) AS n, COALESCE(BIT_XOR(CRC32(CONCAT_WS(',', probe_id, seq, ts, orp_mv))), 0) AS x,
            COALESCE(BIT_XOR(CAST(CONV(LEFT(MD5(CONCAT_WS(',', probe_id, seq, ts, orp_mv)), 8), 16, 10) AS UNSIGNED)), 0) AS m
       FROM readings WHERE probe_id IN (${inList}) AND seq > ? AND seq <= ?`, [...ids, expected.seqAbove, expected.seqAbove + SEQ_SPAN]);
  let lost = 0;
  let duplicated = 0;
  let unexpected = 0;
  const missing: string[] = [];
  for (const [probeId, e] of expected.perProbe) {
    const [row] = await pool.query<ProbeRow[]>(
      `SELECT ? AS probe_id, COUNT(*) AS n, COUNT(DISTINCT seq) AS distinct_seq, MIN(seq) AS lo, MAX(seq) AS hi,
              COUNT(DISTINCT CASE WHEN seq BETWEEN ? AND ? THEN seq END) AS in_range
         FROM readings WHERE probe_id = ? AND seq > ? AND seq <= ?`, [probeId, e.lo, e.hi, probeId, expected.seqAbove, expected.seqAbove + SEQ_SPAN]);
    duplicated += Number(row.n) - Number(row.distinct_seq);
    unexpected += Number(row.distinct_seq) - Number(row.in_range);
    // The generator's seqs are contiguous per probe, so "expected − present in range" is the gap count.
    const gap = e.count - Number(row.in_range);
    lost += Math.max(0, gap);
    if (gap > 0 && missing.length < 10) missing.push(...(await missingSeqs(pool, probeId, e.lo, e.hi)).slice(0, 10 - missing.length));
  }
  const [{ c }] = await pool.query<{ c: number }[]>(
    `SELECT COUNT(*) AS c FROM reading_conflicts WHERE probe_id IN (${inList}) AND incoming_seq > ? AND incoming_seq <= ?`,
    [...ids, expected.seqAbove, expected.seqAbove + SEQ_SPAN]);
  // Both sums in one figure each: CRC32 as the ground-truth check, MD5 because CRC32 sums can cancel.
  const checksumStored = `${hex(Number(sum.x))}/${hex(Number(sum.m))}`;
  const checksumSent = `${hex(expected.checksum)}/${hex(expected.checksumMd5)}`;
  const stored = Number(sum.n);
  return {
    sent: expected.count, stored, lost, duplicated, unexpected, conflicts: Number(c), checksumSent, checksumStored, missing,
    ok: lost === 0 && duplicated === 0 && unexpected === 0 && stored === expected.count && checksumSent === checksumStored,
  };
}

/** Seqs in [lo, hi] with no row (a recursive CTE numbers the range; fine for the sizes tests use). */
async function missingSeqs(pool: Pool, probeId: number, lo: number, hi: number): Promise<string[]> {
  const rows = await pool.query<{ s: number }[]>(
    `WITH RECURSIVE n(s) AS (SELECT ? UNION ALL SELECT s + 1 FROM n WHERE s < ?)
     SELECT s FROM n WHERE NOT EXISTS (SELECT 1 FROM readings r WHERE r.probe_id = ? AND r.seq = n.s) LIMIT 10`,
    [lo, hi, probeId]);
  return rows.map((r) => `${probeId}:${r.s}`);
}

/** Polls until the stored count reaches the expected one (or the time is up); returns the ms it took. */
export async function waitForCount(pool: Pool, expected: Expected, timeoutMs: number): Promise<{ ms: number; reached: boolean }> {
  const ids = [...expected.perProbe.keys()];
  const started = Date.now();
  for (;;) {
    const [{ n }] = await pool.query<{ n: number }[]>(
      `SELECT COUNT(*) AS n FROM readings WHERE probe_id IN (${ids.map(() => '?').join(', ')}) AND seq > ? AND seq <= ?`,
      [...ids, expected.seqAbove, expected.seqAbove + SEQ_SPAN]);
    if (Number(n) >= expected.count) return { ms: Date.now() - started, reached: true };
    if (Date.now() - started > timeoutMs) return { ms: Date.now() - started, reached: false };
    await new Promise((r) => setTimeout(r, 100));
  }
}

export function formatComparison(label: string, c: Comparison): string {
  return `${label}: sent ${c.sent}, stored ${c.stored}, lost ${c.lost}, duplicated ${c.duplicated}, unexpected ${c.unexpected}, `
    + `conflicts ${c.conflicts}, checksum sent ${c.checksumSent} / stored ${c.checksumStored}${c.ok ? ' — OK' : ' — MISMATCH'}`
    + (c.missing.length ? ` (missing e.g. ${c.missing.join(' ')})` : '');
}

/** Dead letters by kind of reason (numbers and quoted values folded to #), for run reports. */
export async function deadLetterSummary(pool: Pool): Promise<{ total: number; reasons: Record<string, number> }> {
  const rows = await pool.query<{ r: string; n: number }[]>(
    `SELECT REGEXP_REPLACE(LEFT(reason, 70), '[0-9][0-9:.TZ-]*|''[^'']*''|"[^"]*"', '#') AS r, COUNT(*) AS n
       FROM dead_letters GROUP BY r ORDER BY n DESC LIMIT 25`);
  const [{ n }] = await pool.query<{ n: number }[]>('SELECT COUNT(*) AS n FROM dead_letters');
  return { total: Number(n), reasons: Object.fromEntries(rows.map((x) => [x.r, Number(x.n)])) };
}

/**
 * Rollups equal the raw aggregate. Buckets of these probes whose 1-minute or 1-hour rollup
 * disagrees with COUNT/MIN/MAX/AVG recomputed from raw readings (a missing rollup counts too).
 */
export async function rollupMismatches(pool: Pool, probeIds: number[]): Promise<{ minute: number; hour: number }> {
  const ids = probeIds.join(',');
  const off = (a: string, b: string) => `ABS(${a} - ${b}) > 1e-6 * GREATEST(1, ABS(${b}))`;
  const check = async (fmt: string, table: string) => {
    const [row] = await pool.query<{ bad: number }[]>(
      `SELECT COUNT(*) AS bad FROM (
         SELECT probe_id, DATE_FORMAT(ts, '${fmt}') AS bucket, COUNT(*) AS n, MIN(orp_mv) AS lo, MAX(orp_mv) AS hi, AVG(orp_mv) AS mean
           FROM readings WHERE probe_id IN (${ids}) GROUP BY probe_id, bucket) r
       LEFT JOIN ${table} x ON x.probe_id = r.probe_id AND x.bucket = r.bucket
       WHERE x.probe_id IS NULL OR x.n <> r.n OR ${off('x.orp_min', 'r.lo')} OR ${off('x.orp_max', 'r.hi')} OR ${off('x.orp_mean', 'r.mean')}`);
    return Number(row.bad);
  };
  return { minute: await check('%Y-%m-%d %H:%i:00', 'rollups_1m'), hour: await check('%Y-%m-%d %H:00:00', 'rollups_1h') };
}
