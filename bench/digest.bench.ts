/**
 * node --import tsx bench/digest.bench.ts — the Shift digest of a whole week for the demo plant
 * (10 tanks, 1-minute and 1-hour rollups, ~100 000 minute rows) timed end to end in the service, plus its JSON
 * size. Target: under a second.
 */
import { fileURLToPath } from 'node:url';
import { initModels } from '../api/src/db/models.ts';
import { Database } from '../api/src/db/database.ts';
import { toSqlTs } from '../api/src/db/timestamps.ts';
import { digestService } from '../api/src/modules/digest/digest.service.ts';
import { seedDemo } from '../scripts/seed.ts';
import { median, startBenchDb } from './lib/bench-db.ts';

const DAYS = 7;
const out = (s: string) => process.stdout.write(s + '\n');

/** Seeds the demo plant and a week of minute rollups on databaseUrl, then times the digest. */
export async function runDigestBench(databaseUrl: string): Promise<{ medianMs: number; bytes: number }> {
  await seedDemo(databaseUrl, 'bench-device-password');
  const db = new Database(databaseUrl, { poolMax: 5 });
  const seq = db.sequelize;
  initModels(seq);
  try {
    const probes = await seq.query<{ id: number }>('SELECT id FROM probes ORDER BY id', { type: 'SELECT' as never });
    const end = Math.floor(Date.now() / 3_600_000) * 3_600_000 - 3_600_000;
    const start = end - DAYS * 86_400_000;
    for (const { id } of probes) {
      for (let day = 0; day < DAYS; day += 1) {
        const rows: string[] = [];
        for (let m = 0; m < 1440; m += 1) {
          const i = day * 1440 + m;
          if (i % 997 < 20) continue; // a 20-minute gap now and then
          const lr = 1.1 + 0.4 * Math.sin(i / 300 + id);
          const orp = 440 + 40 * Math.sin(i / 300 + id);
          const ts = toSqlTs(start + i * 60_000);
          rows.push(`(${id},'${ts}',12,${orp - 3},${orp + 3},${orp},0.6,0.61,0.605,41.5,42.5,42,${lr},${lr - 0.02},${lr + 0.02})`);
        }
        await seq.query(`INSERT INTO rollups_1m VALUES ${rows.join(',')}`);
      }
    }
    await seq.query(`INSERT INTO rollups_1h SELECT probe_id, DATE_FORMAT(bucket, '%Y-%m-%d %H:00:00'), SUM(n), MIN(orp_min), MAX(orp_max),
      SUM(orp_mean * n) / SUM(n), MIN(eh_min), MAX(eh_max), SUM(eh_mean * n) / SUM(n), MIN(temp_min), MAX(temp_max), SUM(temp_mean * n) / SUM(n),
      SUM(log_ratio_mean * n) / SUM(n), MIN(log_ratio_min), MAX(log_ratio_max) FROM rollups_1m GROUP BY 1, 2`);
    const times: number[] = [];
    let bytes = 0;
    for (let k = 0; k < 12; k += 1) {
      const t0 = performance.now();
      const d = await digestService.digest({ from: new Date(start).toISOString(), to: new Date(end).toISOString() });
      bytes = JSON.stringify(d).length;
      times.push(performance.now() - t0);
    }
    // The first calls warm the buffer pool and the JIT; the median speaks for a day of use.
    return { medianMs: median(times.slice(2)), bytes };
  } finally {
    await db.close();
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const db = await startBenchDb();
  try {
    const r = await runDigestBench(db.databaseUrl);
    out(`week digest, demo plant: median ${r.medianMs.toFixed(0)} ms (target < 1000 ms), response ${(r.bytes / 1024).toFixed(0)} KiB`);
  } finally {
    await db.stop();
  }
}
