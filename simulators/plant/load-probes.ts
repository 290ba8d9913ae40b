import mariadb from 'mariadb';
import { toSqlTs } from '../../api/src/db/timestamps.ts';
import { loadProbeTag } from './load.ts';

/**
 * Makes sure the synthetic load probes L0001…L<tanks> exist under `siteTag` (circuit 'LOAD',
 * one tank, probe and calibration each), so load readings are stored rather than
 * dead-lettered. Idempotent: only missing ones are created. The site must exist.
 * @returns how many probes were created
 */
export async function ensureLoadProbes(databaseUrl: string, siteTag: string, tanks: number): Promise<number> {
  const url = new URL(databaseUrl);
  const conn = await mariadb.createConnection({
    host: url.hostname, port: Number(url.port || 3306), user: decodeURIComponent(url.username),
    password: decodeURIComponent(url.password), database: url.pathname.slice(1), connectTimeout: 10_000,
  });
  try {
    const [site] = await conn.query('SELECT id FROM sites WHERE tag = ?', [siteTag]);
    if (!site) throw new Error(`site '${siteTag}' does not exist`);
    const now = toSqlTs(Date.now());
    await conn.beginTransaction();
    let [circuit] = await conn.query("SELECT id FROM circuits WHERE site_id = ? AND tag = 'LOAD'", [site.id]);
    if (!circuit) {
      const res = await conn.query("INSERT INTO circuits (site_id, tag, name, position, created_at, updated_at) VALUES (?, 'LOAD', 'Load test', 99, ?, ?)", [site.id, now, now]);
      circuit = { id: Number(res.insertId) };
    }
    const wanted = Array.from({ length: tanks }, (_, i) => loadProbeTag(i));
    const existing = new Set((await conn.query('SELECT tag FROM probes WHERE tag LIKE ?', ['L%'])).map((r: { tag: string }) => r.tag));
    let created = 0;
    for (const tag of wanted.filter((t) => !existing.has(t))) {
      const tank = await conn.query(
        'INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, band_target, created_at, updated_at) VALUES (?, ?, ?, ?, 100, 8, 25, 14, ?, ?)',
        [circuit.id, `T-${tag}`, `Load tank ${tag}`, created, now, now]);
      await conn.query(
        `INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
         VALUES (?, ?, 'agcl-3m', 0.21, -0.00075, 10, 1, ?, 1, ?, ?)`, [tank.insertId, tag, now, now, now]);
      await conn.query(
        'INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 1, 0.684, 0.0009, ?, ?, ?)',
        [tank.insertId, now, 'load test probe', now]);
      created += 1;
    }
    await conn.commit();
    return created;
  } finally {
    await conn.end();
  }
}
