/**
 * DATABASE_READ_URL (api/src/cluster/read-db.ts): trend queries run on the replica when there
 * is one, and fall back to the primary when the replica cannot be reached.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes, type Sequelize } from 'sequelize';
import { onReadReplica, useReadReplica } from '../../api/src/cluster/read-db.ts';
import { initModels } from '../../api/src/db/models.ts';
import { createSequelize } from '../../api/src/db/sequelize.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';

let db: TestDatabase;
let primary: Sequelize;
let replica: Sequelize;
const which = (s: Sequelize) => s.query<{ c: number }>('SELECT CONNECTION_ID() AS c', { type: QueryTypes.SELECT }).then(() => s);

beforeAll(async () => {
  db = await createTestDatabase();
  primary = createSequelize(db.databaseUrl, 2);
  initModels(primary);
  // The same server stands in for a replica: what matters is which pool the query takes.
  replica = createSequelize(db.databaseUrl, 2);
});
afterAll(async () => {
  useReadReplica(undefined);
  await replica?.close();
  await primary?.close();
  await db?.drop();
});

describe('read replica for trend queries', () => {
  it('when no replica is set, then reads use the primary', async () => {
    useReadReplica(undefined);
    expect(await onReadReplica(which)).toBe(primary);
  });

  it('when a replica is set, then reads use it', async () => {
    useReadReplica(replica);
    expect(await onReadReplica(which)).toBe(replica);
  });

  it('when the replica cannot be reached, then reads fall back to the primary', async () => {
    const url = new URL(db.databaseUrl);
    url.port = String(await findFreePort());
    const dead = createSequelize(url.href, 1);
    useReadReplica(dead);
    try {
      expect(await onReadReplica(which)).toBe(primary);
    } finally {
      useReadReplica(undefined);
      await dead.close();
    }
  });

  it('when the query itself is wrong, then the error is not hidden by a fallback', async () => {
    useReadReplica(replica);
    await expect(onReadReplica((s) => s.query('SELECT * FROM no_such_table'))).rejects.toThrow(/no_such_table/);
  });
});
