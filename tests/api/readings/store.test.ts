import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inTransaction, type Pool } from '../../../api/src/db/pool.ts';
import type { ConvertedReading } from '../../../api/src/modules/readings/convert.ts';
import { deleteExpiredReadings, retentionCutoffMs } from '../../../api/src/modules/readings/retention.repository.ts';
import { storeReadings } from '../../../api/src/modules/readings/readings.repository.ts';
import { logger } from '../../../api/src/lib/logger.ts';
import { createTestDatabase, type TestDatabase } from '../../helpers/test-db.ts';
import { createIngestPool, seedPlant } from '../../ingest/support.ts';

let db: TestDatabase;
let pool: Pool;
let ids: Map<string, number>;

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 2);
  ids = await seedPlant(pool, 'kestrel', [{ tag: 'S1' }, { tag: 'S2' }, { tag: 'S3' }]);
});

afterAll(async () => {
  await pool?.end();
  await db?.drop();
});

const T0 = Date.UTC(2026, 5, 1, 10, 0, 0);

function reading(probeId: number, tsMs: number, orpMv: number, ratio = 1 + orpMv / 100): ConvertedReading {
  return {
    probeId, tankId: 1, probeTag: 'x', siteTag: 'kestrel', tsMs, seq: tsMs, orpMv, tempC: 40 + orpMv / 100,
    ehV: orpMv / 1000 + 0.2, ratio, ferricFraction: ratio / (1 + ratio), flag: 'ok', calibrationVersion: 1, receivedAtMs: tsMs,
  };
}

const store = (rs: ConvertedReading[]) => inTransaction(pool, (conn) => storeReadings(conn, rs, 'test'));

/** The rollup as it should be, aggregated straight from raw readings. */
async function rawAggregate(probeId: number, format: string) {
  return pool.query(
    `SELECT DATE_FORMAT(ts, ?) AS bucket, COUNT(*) AS n, MIN(orp_mv) AS orp_min, MAX(orp_mv) AS orp_max, AVG(orp_mv) AS orp_mean,
            AVG(eh_v) AS eh_mean, AVG(temp_c) AS temp_mean, AVG(LOG10(ratio)) AS log_ratio_mean,
            LOG10(MIN(ratio)) AS log_ratio_min, LOG10(MAX(ratio)) AS log_ratio_max
       FROM readings WHERE probe_id = ? GROUP BY bucket ORDER BY bucket`, [format, probeId]);
}

async function expectRollupsMatchRaw(probeId: number) {
  for (const [table, format] of [['rollups_1m', '%Y-%m-%d %H:%i:00'], ['rollups_1h', '%Y-%m-%d %H:00:00']]) {
    const want = await rawAggregate(probeId, format);
    const got = await pool.query(`SELECT DATE_FORMAT(bucket, '%Y-%m-%d %H:%i:%s') AS bucket, n, orp_min, orp_max, orp_mean, eh_mean, temp_mean,
      log_ratio_mean, log_ratio_min, log_ratio_max FROM ${table} WHERE probe_id = ? ORDER BY bucket`, [probeId]);
    expect(got.map((r: { bucket: string }) => r.bucket)).toEqual(want.map((r: { bucket: string }) => r.bucket));
    got.forEach((g: Record<string, number>, i: number) => {
      for (const k of ['n', 'orp_min', 'orp_max', 'orp_mean', 'eh_mean', 'temp_mean', 'log_ratio_mean', 'log_ratio_min', 'log_ratio_max']) {
        expect(g[k], `${table} ${want[i].bucket} ${k}`).toBeCloseTo(Number(want[i][k]), 9);
      }
    });
  }
}

describe('storeReadings', () => {
  it('when a batch holds new readings, an exact duplicate and a conflicting value, then counts and rows say so', async () => {
    const id = ids.get('S1')!;
    const first = await store([reading(id, T0, 400), reading(id, T0 + 5_000, 401)]);
    expect(first).toMatchObject({ stored: 2, duplicates: 0, conflicts: 0 });
    const again = await store([reading(id, T0, 400), reading(id, T0 + 5_000, 409), reading(id, T0 + 10_000, 402), reading(id, T0 + 10_000, 402)]);
    expect(again).toMatchObject({ stored: 1, duplicates: 2, conflicts: 1 });
    const rows = await pool.query('SELECT orp_mv FROM readings WHERE probe_id = ? ORDER BY ts', [id]);
    expect(rows.map((r: { orp_mv: number }) => r.orp_mv)).toEqual([400, 401, 402]);
    const [conflict] = await pool.query('SELECT stored_orp_mv, incoming_orp_mv, source FROM reading_conflicts WHERE probe_id = ?', [id]);
    expect(conflict).toEqual({ stored_orp_mv: 401, incoming_orp_mv: 409, source: 'test' });
  });

  it('when one batch carries two different values for a new key, then the first is stored and the second is a conflict', async () => {
    const id = ids.get('S3')!;
    const res = await store([reading(id, T0, 300), reading(id, T0, 310)]);
    expect(res).toMatchObject({ stored: 1, duplicates: 0, conflicts: 1 });
    const [row] = await pool.query('SELECT orp_mv FROM readings WHERE probe_id = ?', [id]);
    expect(row.orp_mv).toBe(300);
  });

  it('when late and backfilled readings land in minutes and hours already rolled up, then both rollups equal the raw aggregate', async () => {
    const id = ids.get('S2')!;
    const live = Array.from({ length: 60 }, (_, i) => reading(id, T0 + i * 7_000, 380 + (i % 13), 0.5 + i / 10));
    await store(live);
    await expectRollupsMatchRaw(id);
    // Late data inside already-aggregated minutes, a backfill two hours back, and a sparse far-back reading.
    const late = [
      reading(id, T0 + 3_500, 250, 0.01), reading(id, T0 + 60_500, 500, 50),
      ...Array.from({ length: 30 }, (_, i) => reading(id, T0 - 2 * 3_600_000 + i * 61_000, 420 + i, 2 + i)),
      reading(id, T0 - 30 * 86_400_000, 300, 3),
    ];
    await store(late);
    await expectRollupsMatchRaw(id);
  });

  it('when retention runs, then raw readings before the hour-floored cutoff go and rollups stay', async () => {
    const id = ids.get('S2')!;
    const nowMs = T0 + 5 * 86_400_000;
    const deleted = await deleteExpiredReadings(pool, 10, logger, nowMs);
    expect(deleted).toBe(1);
    expect(retentionCutoffMs(nowMs, 10) % 3_600_000).toBe(0);
    const [{ n }] = await pool.query('SELECT COUNT(*) AS n FROM rollups_1m WHERE probe_id = ? AND bucket < ?', [id, '2026-05-10 00:00:00']);
    expect(n).toBe(1);
  });
});
