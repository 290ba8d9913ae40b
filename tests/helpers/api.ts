import bcrypt from 'bcryptjs';
import type { Express } from 'express';
import type { Sequelize } from 'sequelize';
import request from 'supertest';
import { createApp } from '../../api/src/app.ts';
import { User, initModels } from '../../api/src/db/models.ts';
import { Database } from '../../api/src/db/database.ts';
import { createAuthService, type AuthService } from '../../api/src/modules/auth/auth.service.ts';
import { ROLES, type Role } from '../../shared/schemas/auth.ts';
import { seedDemo } from '../../scripts/seed.ts';
import { createTestDatabase } from './test-db.ts';

export const TEST_PASSWORD = 'correct horse battery';
export const TEST_SECRET = 'test-secret-that-is-long-enough-for-hs256-0123456789';

export type TestApi = {
  app: Express;
  auth: AuthService;
  sequelize: Sequelize;
  databaseUrl: string;
  /** Session cookie of the seeded user of each role. */
  cookies: Record<Role, string>;
  users: Record<Role, number>;
  close(): Promise<void>;
};

/** A fresh database with the demo plant, one user per role (password TEST_PASSWORD) and an app on it. */
export async function createTestApi(opts: { seedPlant?: boolean } = {}): Promise<TestApi> {
  const db = await createTestDatabase();
  if (opts.seedPlant ?? true) await seedDemo(db.databaseUrl, 'sim-device-password-for-tests');
  const database = new Database(db.databaseUrl, { poolMax: 5 });
  const { sequelize } = database;
  initModels(sequelize);
  const hash = await bcrypt.hash(TEST_PASSWORD, 4);
  const users = {} as Record<Role, number>;
  for (const role of ROLES) {
    const [u] = await User.findOrCreate({
      where: { email: `t-${role}@test.example` },
      defaults: { email: `t-${role}@test.example`, name: `Test ${role}`, role, passwordHash: hash, tokensValidAfter: new Date(0) },
    });
    users[role] = u.id;
  }
  const auth = createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 });
  const app = createApp({ auth, ttlS: 3600 });
  const cookies = {} as Record<Role, string>;
  for (const role of ROLES) cookies[role] = await signIn(app, `t-${role}@test.example`, TEST_PASSWORD);
  return {
    app, auth, sequelize, databaseUrl: db.databaseUrl, cookies, users,
    async close() {
      await database.close();
      await db.drop();
    },
  };
}

export async function signIn(app: Express, email: string, password: string): Promise<string> {
  const res = await request(app).post('/api/auth/sign-in').set('X-Ferrisight-Csrf', '1').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in failed for ${email}: ${res.status} ${JSON.stringify(res.body)}`);
  const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? [])[0];
  return cookie.split(';')[0];
}
