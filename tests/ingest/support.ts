/** Shared arrangements for the ingest tests: a plant in the test database, a broker, a worker. */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import bcrypt from 'bcryptjs';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll } from 'vitest';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';
import { createIngestPool, type Pool } from '../../api/src/db/pool.ts';
import { startBroker, type RunningBroker } from '../../ingest/broker/start-broker.ts';

export const SERVICE_PASSWORD = 'test-service-password-0123456789';

export type ProbeSpec = { tag: string; referenceE25V?: number; referenceCoeffVPerK?: number; formalPotentialV?: number | null; formalCoeffVPerK?: number };

/** Inserts site → circuit → tanks → probes (+ calibration v1 unless formalPotentialV is null). Returns probe ids by tag. */
export async function seedPlant(pool: Pool, siteTag: string, probes: ProbeSpec[]): Promise<Map<string, number>> {
  const now = '2026-01-01 00:00:00.000';
  const site = await pool.query('INSERT INTO sites (tag, name, time_zone, created_at, updated_at) VALUES (?, ?, ?, ?, ?)', [siteTag, siteTag, 'UTC', now, now]);
  const circuit = await pool.query('INSERT INTO circuits (site_id, tag, name, position, created_at, updated_at) VALUES (?, ?, ?, 0, ?, ?)', [site.insertId, 'C', 'Circuit', now, now]);
  const ids = new Map<string, number>();
  for (const p of probes) {
    const tank = await pool.query(
      'INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at) VALUES (?, ?, ?, 0, 100, 0.5, 2, ?, ?)',
      [circuit.insertId, `T-${p.tag}`, `Tank ${p.tag}`, now, now]);
    const probe = await pool.query(
      `INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
       VALUES (?, ?, 'agcl-sat', ?, ?, 10, 5, ?, 1, ?, ?)`,
      [tank.insertId, p.tag, p.referenceE25V ?? 0.199, p.referenceCoeffVPerK ?? -0.001, now, now, now]);
    if (p.formalPotentialV !== null) {
      await pool.query(
        'INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at) VALUES (?, 1, ?, ?, ?, ?, ?)',
        [tank.insertId, p.formalPotentialV ?? 0.675, p.formalCoeffVPerK ?? 0, now, 'test', now]);
    }
    ids.set(p.tag, Number(probe.insertId));
  }
  return ids;
}

/** A device account bound to a site (bcrypt cost 4: tests need speed, not strength). */
export async function addDevice(pool: Pool, siteTag: string, username: string, password: string): Promise<void> {
  const now = '2026-01-01 00:00:00.000';
  await pool.query(
    'INSERT INTO devices (site_id, username, password_hash, enabled, created_at, updated_at) SELECT id, ?, ?, 1, ?, ? FROM sites WHERE tag = ?',
    [username, await bcrypt.hash(password, 4), now, now, siteTag]);
}

export function tempDir(): { dir: string; remove: () => void } {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'fs-ingest-'));
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

export async function brokerFor(databaseUrl: string, dataDir: string, port = 0, opts: { screenAtEdge?: boolean } = {}): Promise<RunningBroker> {
  return startBroker({ port, databaseUrl, dataDir, servicePassword: SERVICE_PASSWORD, ...opts });
}

/** Connects and resolves on CONNACK; rejects on refusal (no reconnects: tests must not hang). */
export async function connect(port: number, opts: mqtt.IClientOptions): Promise<MqttClient> {
  return mqtt.connectAsync(`mqtt://127.0.0.1:${port}`, { protocolVersion: 4, reconnectPeriod: 0, connectTimeout: 5_000, ...opts });
}

export async function waitFor<T>(check: () => Promise<T | undefined | false>, timeoutMs = 15_000, stepMs = 50): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`condition not met within ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, stepMs));
  }
}

export const iso = (ms: number) => new Date(ms).toISOString();

export { createIngestPool };

/**
 * One test file's database, pool and embedded broker, set up in beforeAll and torn down in
 * afterAll; `seed` fills the database before the broker starts. Read the fields inside tests.
 */
export function useBrokerRig(seed?: (pool: Pool) => Promise<void>): { db: TestDatabase; pool: Pool; broker: RunningBroker } {
  const rig = {} as { db: TestDatabase; pool: Pool; broker: RunningBroker };
  const tmp = tempDir();
  beforeAll(async () => {
    rig.db = await createTestDatabase();
    rig.pool = createIngestPool(rig.db.databaseUrl, 1);
    await seed?.(rig.pool);
    rig.broker = await brokerFor(rig.db.databaseUrl, tmp.dir);
  });
  afterAll(async () => {
    await rig.broker?.close();
    await rig.pool?.end();
    await rig.db?.drop();
    tmp.remove();
  });
  return rig;
}
