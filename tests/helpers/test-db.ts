/**
 * A fresh, migrated database per test file on the throw-away MariaDB that `npm test` starts:
 *
 *   let db: Awaited<ReturnType<typeof createTestDatabase>>;
 *   beforeAll(async () => { db = await createTestDatabase(); });
 *   afterAll(() => db.drop());
 */
import { randomBytes } from 'node:crypto';
import mariadb from 'mariadb';
import { createMigrator, createSequelize } from '../../api/src/db/sequelize.ts';

export interface TestDatabase {
  /** mariadb://root:…@127.0.0.1:<port>/fs_t_… */
  databaseUrl: string;
  name: string;
  drop(): Promise<void>;
}

function adminUrl(): URL {
  const raw = process.env.TEST_DATABASE_ADMIN_URL;
  if (!raw) throw new Error('TEST_DATABASE_ADMIN_URL is not set: run tests with npm test (it starts the test MariaDB)');
  return new URL(raw);
}

async function adminQuery(url: URL, sql: string): Promise<void> {
  const conn = await mariadb.createConnection({
    host: url.hostname,
    port: Number(url.port || 3306),
    user: decodeURIComponent(url.username),
    password: decodeURIComponent(url.password),
    connectTimeout: 10_000,
  });
  try {
    await conn.query(sql);
  } finally {
    await conn.end();
  }
}

export async function createTestDatabase(): Promise<TestDatabase> {
  const admin = adminUrl();
  const name = `fs_t_${randomBytes(6).toString('hex')}`;
  await adminQuery(admin, `CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  const url = new URL(admin.href);
  url.pathname = `/${name}`;
  const databaseUrl = url.href;

  const sequelize = createSequelize(databaseUrl, 2);
  try {
    await createMigrator(sequelize).up();
  } catch (err) {
    await adminQuery(admin, `DROP DATABASE IF EXISTS \`${name}\``).catch(() => {});
    throw err;
  } finally {
    await sequelize.close();
  }

  let dropped = false;
  return {
    databaseUrl,
    name,
    async drop() {
      if (dropped) return;
      dropped = true;
      await adminQuery(admin, `DROP DATABASE IF EXISTS \`${name}\``);
    },
  };
}
