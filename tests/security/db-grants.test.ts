/**
 * 21 CFR 11.10(e), "record changes shall not obscure previously recorded information": the
 * application's database user cannot UPDATE or DELETE audit and history
 * rows — MariaDB refuses it, not the code — and the application still does all its work under
 * those grants, including 1,000 concurrent setpoint (band) changes → exactly 1,000 audit rows.
 */
import mariadb, { type Connection } from 'mariadb';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { initModels } from '../../api/src/db/models.ts';
import { createSequelize } from '../../api/src/db/sequelize.ts';
import { createAuthService } from '../../api/src/modules/auth/auth.service.ts';
import { APPEND_ONLY_TABLES, unclassifiedTables } from '../../scripts/lib/grants.ts';
import { seedDemo } from '../../scripts/seed.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { createAppUser, type AppUser } from '../reliability/lib/app-user.ts';

let db: TestDatabase;
let app: AppUser;
let conn: Connection;
let sequelize: ReturnType<typeof createSequelize>;

beforeAll(async () => {
  db = await createTestDatabase();
  await seedDemo(db.databaseUrl, 'sim-device-password-for-tests');
  app = await createAppUser(db.name);
  const u = new URL(app.url);
  conn = await mariadb.createConnection({ host: u.hostname, port: Number(u.port), user: u.username, password: decodeURIComponent(u.password), database: db.name });
  sequelize = createSequelize(app.url, 10);
  initModels(sequelize);
});

afterAll(async () => {
  await conn?.end();
  await sequelize?.close();
  await app?.drop();
  await db?.drop();
});

const denied = (sql: string) => expect(conn.query(sql)).rejects.toMatchObject({ errno: expect.toSatisfy((n: number) => [1142, 1143, 1044, 1227].includes(n)) });

describe('database grants of the app user', () => {
  it('when the schema is migrated, then every table is classified as append-only, read-only or read-write on purpose', () => {
    expect(unclassifiedTables(app.plan.map((p) => p.table))).toEqual([]);
  });

  it('when the app user writes an audit row, then INSERT and SELECT work but UPDATE, DELETE, TRUNCATE and DDL are refused by MariaDB', async () => {
    await conn.query("INSERT INTO audit_log (at, user_id, action, entity, reason) VALUES (UTC_TIMESTAMP(3), NULL, 'test.grant', 'grant', 'proof')");
    const [row] = await conn.query("SELECT id FROM audit_log WHERE action = 'test.grant'");
    await denied(`UPDATE audit_log SET reason = 'rewritten' WHERE id = ${row.id}`);
    await denied(`DELETE FROM audit_log WHERE id = ${row.id}`);
    await denied('TRUNCATE TABLE audit_log');
    await denied('DROP TABLE audit_log');
    await denied('ALTER TABLE audit_log ADD COLUMN x INT');
    await denied('CREATE TRIGGER t_x BEFORE INSERT ON audit_log FOR EACH ROW SET NEW.reason = NEW.reason');
    await denied(`GRANT UPDATE ON ${db.name}.audit_log TO CURRENT_USER`);
    const [after] = await conn.query(`SELECT reason FROM audit_log WHERE id = ${row.id}`);
    expect(after.reason).toBe('proof');
  });

  it.each([...APPEND_ONLY_TABLES])('when the app user tries to UPDATE or DELETE %s, then MariaDB refuses', async (table) => {
    const [col] = await conn.query('SELECT column_name AS c FROM information_schema.columns WHERE table_schema = ? AND table_name = ? ORDER BY ordinal_position LIMIT 1', [db.name, table]);
    await denied(`UPDATE \`${table}\` SET \`${col.c}\` = \`${col.c}\` WHERE 1 = 0`);
    await denied(`DELETE FROM \`${table}\` WHERE 1 = 0`);
    await expect(conn.query(`SELECT COUNT(*) AS n FROM \`${table}\``)).resolves.toBeDefined();
  });

  it('when the app user updates an ordinary table, then it may (grants are table by table, not a blanket refusal)', async () => {
    await expect(conn.query('UPDATE tanks SET name = name WHERE 1 = 0')).resolves.toBeDefined();
    await expect(conn.query('DELETE FROM readings WHERE 1 = 0')).resolves.toBeDefined();
    await denied('UPDATE schema_migrations SET name = name WHERE 1 = 0');
  });
});

describe('the API under the app user\'s grants', () => {
  it('when 1,000 band changes arrive at once over 10 tanks, then all are applied and exactly 1,000 audit rows are written', async () => {
    const auth = createAuthService({ jwtSecret: 'grants-test-secret-0123456789-0123456789', ttlS: 3600 });
    const api = createApp({ auth, ttlS: 3600 });
    const signIn = await request(api).post('/api/auth/sign-in').set('X-Ferrisight-Csrf', '1').send({ email: 'metallurgist@kestrel.example', password: 'kestrel-demo' });
    expect(signIn.status).toBe(200);
    const cookie = String(signIn.headers['set-cookie']).split(';')[0];
    const tanks = await conn.query<{ id: number; band_low: number; band_high: number; band_target: number | null }[]>('SELECT id, band_low, band_high, band_target FROM tanks ORDER BY id LIMIT 10');
    const [{ n0: before }] = await conn.query("SELECT COUNT(*) AS n0 FROM audit_log WHERE action LIKE 'band.%'");
    const started = Date.now();
    // Each change moves the low bound a hair (unique per request), so none is "already set" and none needs approval.
    const results = await Promise.all(Array.from({ length: 1000 }, (_, i) => {
      const t = tanks[i % tanks.length];
      const low = Number((t.band_low * (1 + (i + 1) * 1e-6)).toFixed(9));
      return request(api).put(`/api/bands/${t.id}`).set('Cookie', cookie).set('X-Ferrisight-Csrf', '1')
        .send({ low, high: t.band_high, target: t.band_target, reason: `grant test ${i}` });
    }));
    const statuses = results.reduce<Record<number, number>>((a, r) => ({ ...a, [r.status]: (a[r.status] ?? 0) + 1 }), {});
    const [{ n1: after }] = await conn.query("SELECT COUNT(*) AS n1 FROM audit_log WHERE action LIKE 'band.%'");
    const [{ changes }] = await conn.query('SELECT COUNT(*) AS changes FROM band_changes');
    console.log(`1,000 concurrent band changes in ${((Date.now() - started) / 1000).toFixed(1)} s: statuses ${JSON.stringify(statuses)}, audit rows +${Number(after) - Number(before)}, band_changes ${changes}`);
    expect(statuses).toEqual({ 200: 1000 });
    expect(Number(after) - Number(before)).toBe(1000);
    expect(Number(changes)).toBe(1000);
  }, 120_000);

  it('when an admin disables and re-enables a user and someone signs out, then it works under the grants', async () => {
    const auth = createAuthService({ jwtSecret: 'grants-test-secret-0123456789-0123456789', ttlS: 3600 });
    const api = createApp({ auth, ttlS: 3600 });
    const signIn = async (email: string) => String((await request(api).post('/api/auth/sign-in').set('X-Ferrisight-Csrf', '1').send({ email, password: 'kestrel-demo' })).headers['set-cookie']).split(';')[0];
    const admin = await signIn('admin@kestrel.example');
    const [op] = await conn.query("SELECT id FROM users WHERE email = 'operator@kestrel.example'");
    const patch = (disabled: boolean) => request(api).patch(`/api/users/${op.id}`).set('Cookie', admin).set('X-Ferrisight-Csrf', '1').send({ disabled, reason: 'Access review' });
    expect((await patch(true)).status).toBe(200);
    expect((await patch(false)).status).toBe(200);
    expect((await request(api).post('/api/auth/sign-out').set('Cookie', admin).set('X-Ferrisight-Csrf', '1')).status).toBe(204);
  }, 30_000);
});
