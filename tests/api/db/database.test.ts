import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Database, rawPool } from '../../../api/src/db/database.ts';
import { createSequelize } from '../../../api/src/db/sequelize.ts';
import { createTestDatabase, type TestDatabase } from '../../helpers/test-db.ts';

let t: TestDatabase;
beforeAll(async () => { t = await createTestDatabase(); });
afterAll(async () => { await t.drop(); });

describe('Database', () => {
  it('when opened, then Sequelize and the raw pool reach the same database, and the raw pool is found from Sequelize', async () => {
    const db = new Database(t.databaseUrl, { poolMax: 2, rawPoolMax: 1 });
    try {
      const [viaSequelize] = await db.sequelize.query<{ name: string }>('SELECT DATABASE() AS name', { type: QueryTypes.SELECT });
      const [viaPool] = (await rawPool(db.sequelize).query('SELECT DATABASE() AS name')) as { name: string }[];
      expect(viaSequelize.name).toBe(t.name);
      expect(viaPool.name).toBe(t.name);
      expect(rawPool(db.sequelize)).toBe(db.pool);
    } finally {
      await db.close();
    }
  });

  it('when closed, then both the Sequelize pool and the raw pool are ended, and the raw pool is no longer found', async () => {
    const db = new Database(t.databaseUrl, { poolMax: 2, rawPoolMax: 1 });
    const pool = db.pool;
    await pool.query('SELECT 1');
    await db.close();
    await expect(pool.query('SELECT 1')).rejects.toThrow();
    await expect(db.sequelize.query('SELECT 1')).rejects.toThrow();
    expect(() => rawPool(db.sequelize)).toThrow(/not opened through Database/);
  });

  it('when a Sequelize instance was made without Database, then asking for its raw pool fails loudly', async () => {
    const sequelize = createSequelize(t.databaseUrl, 1);
    try {
      expect(() => rawPool(sequelize)).toThrow(/not opened through Database/);
    } finally {
      await sequelize.close();
    }
  });
});
