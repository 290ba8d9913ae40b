/**
 * The runtime database user as npm start makes it (scripts/lib/grants.ts), for one test
 * database: a fresh account with only the synced table grants, and a URL to connect as it.
 */
import { randomBytes } from 'node:crypto';
import mariadb, { type Connection } from 'mariadb';
import { syncAppGrants, type TablePrivileges } from '../../../scripts/lib/grants.ts';

export type AppUser = { name: string; url: string; plan: TablePrivileges[]; drop(): Promise<void> };

export async function adminConnection(): Promise<Connection> {
  const u = new URL(process.env.TEST_DATABASE_ADMIN_URL ?? '');
  return mariadb.createConnection({
    host: u.hostname, port: Number(u.port), user: decodeURIComponent(u.username), password: decodeURIComponent(u.password),
  });
}

/** Creates 'fs_app_…'@'127.0.0.1' and grants it what the supervisor grants the app user on `database`. */
export async function createAppUser(database: string): Promise<AppUser> {
  const name = `fs_app_${randomBytes(4).toString('hex')}`;
  const password = randomBytes(18).toString('base64url');
  const conn = await adminConnection();
  try {
    await conn.query(`CREATE USER '${name}'@'127.0.0.1' IDENTIFIED BY '${password}'`);
    const run = async (sql: string) => ((await conn.query(sql)) as Record<string, unknown>[]).map?.((r) => String(Object.values(r)[0])) ?? [];
    const plan = await syncAppGrants(run, database, { name, host: '127.0.0.1' });
    const admin = new URL(process.env.TEST_DATABASE_ADMIN_URL ?? '');
    const url = `mariadb://${name}:${password}@${admin.host}/${database}`;
    return {
      name, url, plan,
      async drop() {
        const c = await adminConnection();
        await c.query(`DROP USER IF EXISTS '${name}'@'127.0.0.1'`).finally(() => c.end());
      },
    };
  } finally {
    await conn.end();
  }
}
