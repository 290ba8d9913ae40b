import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createMigrator, createSequelize } from '../../api/src/db/sequelize.ts';
import { createTestDatabase } from '../helpers/test-db.ts';

let db: Awaited<ReturnType<typeof createTestDatabase>>;
beforeAll(async () => {
  db = await createTestDatabase();
});
afterAll(async () => db?.drop());

describe('migrations', () => {
  it('when run again on a migrated database, then nothing is pending and data is kept', async () => {
    const seq = createSequelize(db.databaseUrl, 2);
    try {
      await seq.query(`INSERT INTO sites (tag, name, time_zone, created_at, updated_at) VALUES ('keep', 'Kept', 'UTC', NOW(3), NOW(3))`);
      const migrator = createMigrator(seq);
      expect(await migrator.pending()).toEqual([]);
      expect(await migrator.up()).toEqual([]);
      const rows = await seq.query<{ tag: string }>('SELECT tag FROM sites', { type: QueryTypes.SELECT });
      expect(rows.map((r) => r.tag)).toContain('keep');
    } finally {
      await seq.close();
    }
  });

  it('when every migration is undone and redone, then the schema comes back with all tables', async () => {
    const seq = createSequelize(db.databaseUrl, 2);
    try {
      await seq.query('DELETE FROM sites');
      const migrator = createMigrator(seq);
      const applied = (await migrator.executed()).length;
      await migrator.down({ to: 0 });
      expect((await migrator.executed()).length).toBe(0);
      await migrator.up();
      expect((await migrator.executed()).length).toBe(applied);
      const tables = await seq.query<{ t: string }>('SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE()', { type: QueryTypes.SELECT });
      const names = tables.map((r) => r.t);
      for (const t of ['users', 'sites', 'circuits', 'tanks', 'probes', 'readings', 'audit_log', 'calibrations', 'devices', 'dead_letters']) {
        expect(names).toContain(t);
      }
    } finally {
      await seq.close();
    }
  });
});
