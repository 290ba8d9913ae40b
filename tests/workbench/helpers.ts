import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { toSqlTs } from '../../api/src/db/timestamps.ts';
import type { Role } from '../../shared/schemas/auth.ts';
import type { TestApi } from '../helpers/api.ts';

/** Request helpers for the workbench tests: a role's session cookie, and the CSRF header on writes. */
export function as(t: TestApi, role: Role) {
  const cookie = t.cookies[role];
  return {
    get: (path: string) => request(t.app).get(path).set('Cookie', cookie),
    post: (path: string, body?: object) => request(t.app).post(path).set('Cookie', cookie).set('X-Ferrisight-Csrf', '1').send(body),
    put: (path: string, body?: object) => request(t.app).put(path).set('Cookie', cookie).set('X-Ferrisight-Csrf', '1').send(body),
    upload: (path: string, content: Buffer | string, fileName = 'assays.csv') =>
      request(t.app).post(path).set('Cookie', cookie).set('X-Ferrisight-Csrf', '1')
        .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), { filename: fileName, contentType: 'text/csv' }),
  };
}

/** Tank id by tag from the demo plant. */
export async function tankId(t: TestApi, tag: string): Promise<number> {
  const rows = await t.sequelize.query<{ id: number }>(`SELECT id FROM tanks WHERE tag = '${tag}'`, { type: QueryTypes.SELECT });
  return rows[0].id;
}

export async function probeOf(t: TestApi, tankTag: string): Promise<{ id: number; tag: string }> {
  const rows = await t.sequelize.query<{ id: number; tag: string }>(
    `SELECT p.id, p.tag FROM probes p JOIN tanks t ON t.id = p.tank_id WHERE t.tag = '${tankTag}' AND p.active = 1`, { type: QueryTypes.SELECT });
  return rows[0];
}

export async function auditActions(t: TestApi, entity: string, entityId: number | string): Promise<string[]> {
  const rows = await t.sequelize.query<{ action: string }>(
    `SELECT action FROM audit_log WHERE entity = '${entity}' AND entity_id = '${entityId}' ORDER BY id`, { type: QueryTypes.SELECT });
  return rows.map((r) => r.action);
}


/** Writes converted readings straight into the table (the ingest worker's job in production). */
export async function insertReadings(
  t: TestApi, probeId: number, rows: Array<{ tsMs: number; orpMv: number; tempC: number; ratio: number; version?: number }>,
): Promise<void> {
  for (let i = 0; i < rows.length; i += 1000) {
    const values = rows.slice(i, i + 1000).map((r) =>
      `(${probeId}, '${toSqlTs(r.tsMs)}', ${r.orpMv}, ${r.tempC}, 0.7, ${r.ratio}, ${r.ratio / (1 + r.ratio)}, 'ok', ${r.version ?? 1}, NOW(3))`);
    await t.sequelize.query(`INSERT INTO readings (probe_id, ts, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES ${values.join(',')}`);
  }
}
