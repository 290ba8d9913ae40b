import { createHash } from 'node:crypto';
import { placeholders, toSqlTs, type PoolConnection } from '../../db/pool.ts';
import type { ConvertedReading } from './convert.ts';
import { addToRollups } from './rollups.repository.ts';

export type StoreResult = {
  /** New rows written. */
  stored: number;
  /** Same (probe, ts) with the same orpMv and tempC: a redelivery, ignored. */
  duplicates: number;
  /** Same (probe, ts) with different values: logged to reading_conflicts, stored row kept. */
  conflicts: number;
  /** The readings that became new rows (for live publishing). */
  inserted: ConvertedReading[];
};

type Stored = { orpMv: number; tempC: number };
/** The columns of a readings row (a converted reading without its plant names). */
export type ReadingRow = Omit<ConvertedReading, 'tankId' | 'probeTag' | 'siteTag'>;
const CHUNK = 1000;

const keyOf = (probeId: number, sqlTs: string) => `${probeId}|${sqlTs}`;

/**
 * Locks and reads the rows that already exist for these keys. FOR UPDATE matters: it takes
 * record and gap locks, so a concurrent writer (a second worker, the API's import) either
 * waits or deadlocks and retries — it can never insert between our check and our insert.
 */
async function lockExisting(conn: PoolConnection, keys: { probeId: number; ts: string }[]): Promise<Map<string, Stored>> {
  const found = new Map<string, Stored>();
  for (let i = 0; i < keys.length; i += CHUNK) {
    const byProbe = new Map<number, string[]>();
    for (const k of keys.slice(i, i + CHUNK)) {
      const list = byProbe.get(k.probeId);
      if (list) list.push(k.ts);
      else byProbe.set(k.probeId, [k.ts]);
    }
    const params: (number | string)[] = [];
    const where = [...byProbe].map(([probeId, list]) => {
      params.push(probeId, ...list);
      return `(probe_id = ? AND ts IN (${list.map(() => '?').join(', ')}))`;
    });
    const rows: { probe_id: number; ts: string; orp_mv: number; temp_c: number }[] = await conn.query(
      `SELECT probe_id, ts, orp_mv, temp_c FROM readings WHERE ${where.join(' OR ')} FOR UPDATE`, params);
    for (const r of rows) found.set(keyOf(r.probe_id, r.ts), { orpMv: r.orp_mv, tempC: r.temp_c });
  }
  return found;
}

const ER_DUP_ENTRY = 1062;

/**
 * The one INSERT of readings. A plain multi-row INSERT (never IGNORE): a key that exists fails
 * the whole statement. With `reconvert`, an existing row keeps its measurement and takes the new
 * conversion instead (a recalibration rewrites rows it has locked, so it never adds one).
 * A prepared statement (binary protocol): the server parses the SQL once per row count and no
 * value is escaped into text, about a third faster than a text query of the same rows.
 */
async function insertRows(conn: PoolConnection, rows: { r: ReadingRow; ts: string }[], reconvert = false): Promise<void> {
  let receivedMs = NaN;
  let received = '';
  // One flat array filled in place (no array per row): this runs for every reading stored.
  const params: (string | number | null)[] = new Array(rows.length * 11);
  let i = 0;
  for (const { r, ts } of rows) {
    // Readings of one message share their receipt time: format it once.
    if (r.receivedAtMs !== receivedMs) [receivedMs, received] = [r.receivedAtMs, toSqlTs(r.receivedAtMs)];
    params[i++] = r.probeId; params[i++] = ts; params[i++] = r.seq; params[i++] = r.orpMv; params[i++] = r.tempC; params[i++] = r.ehV;
    params[i++] = r.ratio; params[i++] = r.ferricFraction; params[i++] = r.flag; params[i++] = r.calibrationVersion; params[i++] = received;
  }
  await conn.execute(
    `INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at)
     VALUES ${placeholders(rows.length, 11)}${reconvert ? RECONVERT : ''}`, params);
}

const RECONVERT = ` ON DUPLICATE KEY UPDATE eh_v = VALUES(eh_v), ratio = VALUES(ratio), ferric_fraction = VALUES(ferric_fraction),
  flag = VALUES(flag), calibration_version = VALUES(calibration_version)`;

/** A stored reading's measurement, as a recalibration reads it back. */
export type StoredReading = { probeId: number; ts: string; seq: number | null; orpMv: number; tempC: number; receivedAt: string };

/**
 * One page of a probe's readings in time order from `after` (exclusive when `afterExclusive`)
 * to `before` (exclusive), locked FOR UPDATE so the retention purge cannot delete one before
 * it is rewritten. Times are SQL text (see toSqlTs) so a page's last key starts the next.
 */
export async function lockReadingsPage(
  conn: PoolConnection, probeId: number, after: string, afterExclusive: boolean, before: string, limit: number,
): Promise<StoredReading[]> {
  const rows: { probe_id: number; ts: string; seq: number | null; orp_mv: number; temp_c: number; received_at: string }[] = await conn.query(
    `SELECT probe_id, ts, seq, orp_mv, temp_c, received_at FROM readings
      WHERE probe_id = ? AND ts ${afterExclusive ? '>' : '>='} ? AND ts < ? ORDER BY ts LIMIT ${Number(limit)} FOR UPDATE`,
    [probeId, after, before]);
  return rows.map((r) => ({ probeId: r.probe_id, ts: r.ts, seq: r.seq, orpMv: r.orp_mv, tempC: r.temp_c, receivedAt: r.received_at }));
}

/** Writes a new conversion over readings already stored (and locked by lockReadingsPage). */
export async function rewriteConversions(conn: PoolConnection, readings: ReadingRow[]): Promise<void> {
  for (let i = 0; i < readings.length; i += CHUNK) {
    await insertRows(conn, readings.slice(i, i + CHUNK).map((r) => ({ r, ts: toSqlTs(r.tsMs) })), true);
  }
}

/**
 * Idempotent store of converted readings, inside the caller's transaction (one per flush).
 * Primary key (probe_id, ts): an exact duplicate is ignored; a different value for an existing
 * key is written to reading_conflicts and the first stored value kept.
 *
 * Most chunks hold only new keys, so each chunk of distinct keys is first written with one
 * plain INSERT. When a key already exists the statement fails with a duplicate-key error and
 * InnoDB rolls that statement back as a whole (the transaction goes on); that chunk is then
 * sorted under lock (lockExisting) and only its absent keys inserted. Never INSERT IGNORE:
 * any other surprise is a loud error that rolls the flush back (and it is retried).
 * The new rows are added to their 1 m and 1 h rollups in the same transaction.
 * @param source who sent the readings, recorded on conflicts (e.g. 'mqtt', 'import:file.csv')
 */
export async function storeReadings(conn: PoolConnection, readings: ConvertedReading[], source: string): Promise<StoreResult> {
  const result: StoreResult = { stored: 0, duplicates: 0, conflicts: 0, inserted: [] };
  if (readings.length === 0) return result;
  const firsts = new Map<string, { r: ConvertedReading; ts: string }>();
  const repeats: { r: ConvertedReading; key: string }[] = [];
  for (const r of readings) {
    const ts = toSqlTs(r.tsMs);
    const key = keyOf(r.probeId, ts);
    if (firsts.has(key)) repeats.push({ r, key });
    else firsts.set(key, { r, ts });
  }
  const conflicts: { r: ConvertedReading; ts: string; stored: Stored }[] = [];
  const judge = (r: ConvertedReading, ts: string, stored: Stored) => {
    if (stored.orpMv === r.orpMv && stored.tempC === r.tempC) result.duplicates += 1;
    else conflicts.push({ r, ts, stored });
  };
  /** Rows that were stored before this flush, for the keys of chunks that had any. */
  const existing = new Map<string, Stored>();
  const distinct = [...firsts.values()];
  for (let i = 0; i < distinct.length; i += CHUNK) {
    const chunk = distinct.slice(i, i + CHUNK);
    try {
      await insertRows(conn, chunk);
      for (const { r } of chunk) result.inserted.push(r);
      continue;
    } catch (err) {
      if ((err as { errno?: number }).errno !== ER_DUP_ENTRY) throw err;
    }
    const found = await lockExisting(conn, chunk.map(({ r, ts }) => ({ probeId: r.probeId, ts })));
    const fresh: typeof chunk = [];
    for (const item of chunk) {
      const stored = found.get(keyOf(item.r.probeId, item.ts));
      if (stored) {
        existing.set(keyOf(item.r.probeId, item.ts), stored);
        judge(item.r, item.ts, stored);
      } else fresh.push(item);
    }
    if (fresh.length > 0) await insertRows(conn, fresh);
    for (const { r } of fresh) result.inserted.push(r);
  }
  for (const { r, key } of repeats) {
    const first = firsts.get(key)!;
    judge(r, first.ts, existing.get(key) ?? { orpMv: first.r.orpMv, tempC: first.r.tempC });
  }
  await insertConflicts(conn, conflicts.map(({ r, ts, stored }) => [
    r.probeId, ts, stored.orpMv, stored.tempC, r.orpMv, r.tempC, r.seq, source.slice(0, 200), toSqlTs(r.receivedAtMs),
  ]));
  await addToRollups(conn, result.inserted);
  result.stored = result.inserted.length;
  result.conflicts = conflicts.length;
  return result;
}

type ConflictParams = [number, string, number, number, number, number, number | null, string, string];

/**
 * Logs conflicting values, once each: the fingerprint (probe, instant, incoming values) is
 * unique, so a device re-sending the same conflicting message adds no second row. The table
 * is insert-only for the app, hence read-then-insert rather than an upsert.
 */
async function insertConflicts(conn: PoolConnection, rows: ConflictParams[]): Promise<void> {
  const fresh = new Map<string, ConflictParams>();
  for (const p of rows) {
    fresh.set(createHash('sha256').update([p[0], p[1], p[4], p[5], p[6] ?? ''].join('\0')).digest('hex'), p);
  }
  const prints = [...fresh.keys()];
  for (let i = 0; i < prints.length; i += CHUNK) {
    const some = prints.slice(i, i + CHUNK);
    const known: { fp: string }[] = await conn.query(
      `SELECT HEX(fingerprint) AS fp FROM reading_conflicts WHERE fingerprint IN (${some.map(() => 'UNHEX(?)').join(',')})`, some);
    for (const k of known) fresh.delete(k.fp.toLowerCase());
  }
  const list = [...fresh.entries()];
  for (let i = 0; i < list.length; i += CHUNK) {
    const part = list.slice(i, i + CHUNK);
    await conn.query(
      `INSERT INTO reading_conflicts (probe_id, ts, stored_orp_mv, stored_temp_c, incoming_orp_mv, incoming_temp_c, incoming_seq, source, received_at, fingerprint)
       VALUES ${part.map(() => '(?, ?, ?, ?, ?, ?, ?, ?, ?, UNHEX(?))').join(', ')}`,
      part.flatMap(([fp, p]) => [...p, fp]));
  }
}
