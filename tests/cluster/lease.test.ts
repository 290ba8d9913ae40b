/**
 * The database lease behind "runs once across the cluster" (api/src/cluster/lease.ts): one
 * holder at a time, a successor once the holder stops renewing, at once after a clean release,
 * a fencing token that grows with every change of holder, and progress handed over.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Lease } from '../../api/src/cluster/lease.ts';
import { createIngestPool, type Pool } from '../../api/src/db/pool.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';

let db: TestDatabase;
let pool: Pool;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

beforeAll(async () => {
  db = await createTestDatabase();
  pool = createIngestPool(db.databaseUrl, 4);
});
afterAll(async () => {
  await pool?.end();
  await db?.drop();
});

describe('database lease', () => {
  it('when two processes contend, then exactly one holds the lease and the other waits', async () => {
    const a = new Lease(pool, 'contend', { ttlMs: 2_000, owner: 'a' });
    const b = new Lease(pool, 'contend', { ttlMs: 2_000, owner: 'b' });
    const results = await Promise.all([a.tryAcquire(), b.tryAcquire()]);
    expect(results.filter(Boolean)).toHaveLength(1);
    // Renewals by the holder keep it; the other keeps failing.
    const holder = results[0] ? a : b;
    const other = holder === a ? b : a;
    for (let i = 0; i < 3; i += 1) {
      expect(await holder.tryAcquire()).toBe(true);
      expect(await other.tryAcquire()).toBe(false);
    }
  });

  it('when the holder stops renewing (a killed process), then another takes over after the TTL with a higher token', async () => {
    const a = new Lease(pool, 'expiry', { ttlMs: 600, owner: 'a' });
    const b = new Lease(pool, 'expiry', { ttlMs: 600, owner: 'b' });
    expect(await a.tryAcquire()).toBe(true);
    const first = a.token;
    expect(await b.tryAcquire()).toBe(false);
    await sleep(700);
    // The silent holder already considers itself out (local margin), before anyone else is in.
    expect(a.held).toBe(false);
    expect(await b.tryAcquire()).toBe(true);
    expect(b.token).toBe(first + 1);
    expect(await a.tryAcquire()).toBe(false);
  });

  it('when the holder stops cleanly, then the successor gets the lease at once and resumes from its progress', async () => {
    const a = new Lease(pool, 'handover', { ttlMs: 60_000, owner: 'a' });
    const b = new Lease(pool, 'handover', { ttlMs: 60_000, owner: 'b' });
    expect(await a.tryAcquire()).toBe(true);
    await a.saveProgress(1234);
    await a.stop();
    expect(await b.tryAcquire()).toBe(true);
    expect(b.progress).toBe(1234);
  });

  it('when started in the background, then it renews on its own and a second one stays out', async () => {
    const a = new Lease(pool, 'background', { ttlMs: 900, owner: 'a' }).start();
    const b = new Lease(pool, 'background', { ttlMs: 900, owner: 'b' }).start();
    await sleep(2_000);
    expect([a.held, b.held].filter(Boolean)).toHaveLength(1);
    const [holder, other] = a.held ? [a, b] : [b, a];
    await holder.stop();
    await sleep(600);
    expect(other.held).toBe(true);
    await other.stop();
  });
});
