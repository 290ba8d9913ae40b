/**
 * npm run bench:trend — a 30-day trend of one tank at 1 Hz (2,592,000 raw rows) returned as
 * ≤ 2,000 points, timed beside the naive approach (read every raw row, thin it in Node).
 * Target: planned query < 200 ms median.
 */
import { QueryTypes } from 'sequelize';
import { createSequelize } from '../api/src/db/sequelize.ts';
import { toSqlTs } from '../api/src/db/timestamps.ts';
import { queryTrend } from '../api/src/modules/plant/trend.repository.ts';
import { median, startBenchDb } from './lib/bench-db.ts';

const DAYS = 30;
const ROWS = DAYS * 86_400;
const CHUNK = 10_000;
const out = (s: string) => process.stdout.write(s + '\n');

const db = await startBenchDb();
const seq = createSequelize(db.databaseUrl, 2);
try {
  const start = Date.UTC(2026, 9, 1);
  const to = new Date(start + DAYS * 86_400_000);
  let t0 = performance.now();
  for (let i = 0; i < ROWS; i += CHUNK) {
    const values: string[] = [];
    for (let j = i; j < Math.min(ROWS, i + CHUNK); j++) {
      const ts = toSqlTs(start + j * 1000);
      const orp = 420 + 30 * Math.sin(j / 20_000) + ((j * 7919) % 13) / 13;
      values.push(`(1,'${ts}',${j},${orp.toFixed(2)},42.5,${(orp / 1000 + 0.2).toFixed(5)},${(10 ** (orp / 400)).toFixed(4)},0.9,'ok',1,'${ts}')`);
    }
    await seq.query(`INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES ${values.join(',')}`);
  }
  const insertS = (performance.now() - t0) / 1000;
  t0 = performance.now();
  await seq.query(`INSERT INTO rollups_1m SELECT probe_id, DATE_FORMAT(ts, '%Y-%m-%d %H:%i:00'), COUNT(*), MIN(orp_mv), MAX(orp_mv), AVG(orp_mv),
    MIN(eh_v), MAX(eh_v), AVG(eh_v), MIN(temp_c), MAX(temp_c), AVG(temp_c), AVG(LOG10(ratio)), MIN(LOG10(ratio)), MAX(LOG10(ratio))
    FROM readings GROUP BY 1, 2`);
  await seq.query(`INSERT INTO rollups_1h SELECT probe_id, DATE_FORMAT(bucket, '%Y-%m-%d %H:00:00'), SUM(n), MIN(orp_min), MAX(orp_max), SUM(orp_mean*n)/SUM(n),
    MIN(eh_min), MAX(eh_max), SUM(eh_mean*n)/SUM(n), MIN(temp_min), MAX(temp_max), SUM(temp_mean*n)/SUM(n), SUM(log_ratio_mean*n)/SUM(n), MIN(log_ratio_min), MAX(log_ratio_max)
    FROM rollups_1m GROUP BY 1, 2`);
  out(`loaded ${ROWS.toLocaleString('en')} raw rows in ${insertS.toFixed(1)} s (${Math.round(ROWS / insertS).toLocaleString('en')} rows/s), rollups in ${((performance.now() - t0) / 1000).toFixed(1)} s`);

  const planned: number[] = [];
  let points = 0;
  for (let i = 0; i < 15; i++) {
    const t = performance.now();
    const r = await queryTrend(seq, 1, new Date(start), to, 2000, 1);
    planned.push(performance.now() - t);
    points = r.t.length;
  }
  const naive: number[] = [];
  for (let i = 0; i < 3; i++) {
    const t = performance.now();
    const rows = await seq.query<{ t: number; ratio: number }>(
      'SELECT UNIX_TIMESTAMP(ts) AS t, ratio, orp_mv, temp_c FROM readings WHERE probe_id = 1 AND ts >= :from AND ts < :to ORDER BY ts',
      { replacements: { from: new Date(start), to }, type: QueryTypes.SELECT },
    );
    const step = Math.ceil(rows.length / 2000);
    rows.filter((_, k) => k % step === 0);
    naive.push(performance.now() - t);
  }
  const p = median(planned);
  const n = median(naive);
  out(`30-day trend, ${points} points from rollups: median ${p.toFixed(1)} ms over 15 runs (target < 200 ms: ${p < 200 ? 'met' : 'NOT met'})`);
  out(`naive raw read of ${ROWS.toLocaleString('en')} rows: median ${n.toFixed(0)} ms over 3 runs`);
  out(`speed-up: ${(n / p).toFixed(0)}×`);
  out(`peak RSS: ${(process.memoryUsage().rss / 2 ** 20).toFixed(0)} MiB (bench process)`);
} finally {
  await seq.close();
  await db.stop();
}
