import bcrypt from 'bcryptjs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { AuditEntry, Calibration, Device, Probe, Tank, initModels } from '../../api/src/db/models.ts';
import { createIngestPool, inTransaction, type Pool } from '../../api/src/db/pool.ts';
import { createSequelize } from '../../api/src/db/sequelize.ts';
import { createAuthService } from '../../api/src/modules/auth/auth.service.ts';
import { firstRunRepository } from '../../api/src/modules/first-run/first-run.repository.ts';
import { insertDeadLetters } from '../../api/src/modules/readings/dead-letters.repository.ts';
import { deleteExpiredRefusals } from '../../api/src/modules/readings/retention.repository.ts';
import { logger } from '../../api/src/lib/logger.ts';
import { STARTING_FORMAL_POTENTIAL } from '../../shared/schemas/plant-setup.ts';
import { LIGHT_SOLUTION } from '../../shared/redox/index.ts';
import { createTestApi, signIn, TEST_SECRET, type TestApi } from '../helpers/api.ts';
import { createTestDatabase } from '../helpers/test-db.ts';

let t: TestApi;
let pool: Pool;
beforeAll(async () => {
  t = await createTestApi({ seedPlant: false });
  pool = createIngestPool(t.databaseUrl, 2);
});
afterAll(async () => {
  await pool?.end();
  await t?.close();
});

const as = (role: 'admin' | 'engineer' | 'operator', method: 'get' | 'post' | 'patch', path: string) =>
  request(t.app)[method](path).set('X-Ferrisight-Csrf', '1').set('Cookie', t.cookies[role]);
const ids: Record<string, number> = {};

describe('plant setup, from an empty plant to a gateway', () => {
  it('when an admin adds a site, circuit and tank, and an engineer a probe and gateway, then each is stored and audited', async () => {
    let res = await as('admin', 'post', '/api/plant-setup/sites').send({ tag: 'heron', name: 'Heron Downs', timeZone: 'Australia/Perth' });
    expect(res.status).toBe(201);
    ids.site = res.body.site.id;
    res = await as('admin', 'post', '/api/plant-setup/circuits').send({ siteId: ids.site, tag: 'L', name: 'Leach', process: 'ferric-leach', position: 1 });
    expect(res.status).toBe(201);
    expect(res.body.circuit.position).toBe(1);
    ids.circuit = res.body.circuit.id;
    res = await as('admin', 'post', '/api/plant-setup/tanks').send({
      circuitId: ids.circuit, tag: 'H1', name: 'Leach 1', position: 1, volumeM3: 450, feTotalGPerL: 12, bandLow: 2, bandHigh: 20,
      formalPotentialV: STARTING_FORMAL_POTENTIAL.valueV,
    });
    expect(res.status).toBe(201);
    ids.tank = res.body.tank.id;
    // The starting value is Light's solution's potential (Standard Methods 2580; ASTM D1498: 0.675 V vs SHE).
    expect(STARTING_FORMAL_POTENTIAL.valueV).toBe(LIGHT_SOLUTION.ehV);
    const cal = await Calibration.findOne({ where: { tankId: ids.tank } });
    expect({ version: cal?.version, v: cal?.formalPotentialV }).toEqual({ version: 1, v: 0.675 });
    res = await as('engineer', 'post', '/api/plant-setup/probes').send({
      tankId: ids.tank, tag: 'H1-ORP', referenceId: 'custom', referenceE25V: 0.205, referenceCoeffVPerK: -0.0007, toleranceMv: 10, intervalS: 2,
      installedAt: '2026-12-01T06:00:00Z',
    });
    expect(res.status).toBe(201);
    ids.probe = res.body.probe.id;
    expect(res.body.probe).toMatchObject({ referenceId: 'custom', referenceE25V: 0.205, referenceCoeffVPerK: -0.0007 });
    res = await as('engineer', 'post', '/api/plant-setup/gateways').send({ siteId: ids.site, username: 'heron-gw-1', name: 'Leach MCC' });
    expect(res.status).toBe(201);
    ids.gateway = res.body.gateway.id;
    const device = await Device.findByPk(ids.gateway);
    expect(await bcrypt.compare(res.body.password, device!.passwordHash)).toBe(true);
    const audit = await AuditEntry.findAll({ where: { action: ['site.create', 'circuit.create', 'tank.create', 'probe.create', 'gateway.create'] } });
    expect(audit).toHaveLength(5);
    expect(JSON.stringify(audit.map((a) => a.afterJson))).not.toContain('passwordHash');
    expect(JSON.stringify(audit.map((a) => a.afterJson))).not.toContain(res.body.password);
  });

  it('when the Floor loads, then the new tank is on it with its probe', async () => {
    const res = await as('operator', 'get', '/api/plant');
    const site = res.body.sites.find((s: { tag: string }) => s.tag === 'heron');
    expect(site.circuits[0].tanks[0]).toMatchObject({ tag: 'H1', probe: { tag: 'H1-ORP' }, calibration: { version: 1 } });
  });

  it('when fields are bad, then 400 problem+json names each field in words', async () => {
    const res = await as('admin', 'post', '/api/plant-setup/tanks').send({
      circuitId: ids.circuit, tag: 'bad tag!', name: '', position: 0, volumeM3: -1, bandLow: 5, bandHigh: 2, formalPotentialV: 3,
    });
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
    expect(res.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['bandLow', 'formalPotentialV', 'name', 'position', 'tag', 'volumeM3']);
    const tz = await as('admin', 'post', '/api/plant-setup/sites').send({ tag: 'x1', name: 'X', timeZone: 'Mars/Olympus' });
    expect(tz.body.errors).toEqual([{ path: 'timeZone', message: expect.stringMatching(/IANA/) }]);
  });

  it('when a tag or username is taken (in any case), then 409 and nothing is added', async () => {
    expect((await as('admin', 'post', '/api/plant-setup/sites').send({ tag: 'heron', name: 'Again', timeZone: 'UTC' })).status).toBe(409);
    expect((await as('admin', 'post', '/api/plant-setup/gateways').send({ siteId: ids.site, username: 'HERON-GW-1' })).status).toBe(409);
  });

  it('when an engineer edits a probe without a reason, then 400; with one, the audit keeps before, after and reason', async () => {
    expect((await as('engineer', 'patch', `/api/plant-setup/probes/${ids.probe}`).send({ intervalS: 5 })).status).toBe(400);
    const res = await as('engineer', 'patch', `/api/plant-setup/probes/${ids.probe}`).send({ intervalS: 5, reason: 'Gateway polls every 5 s' });
    expect(res.status).toBe(200);
    const entry = await AuditEntry.findOne({ where: { action: 'probe.update', entityId: String(ids.probe) } });
    expect(entry).toMatchObject({ reason: 'Gateway polls every 5 s', userId: t.users.engineer });
    expect((entry!.beforeJson as { intervalS: number }).intervalS).toBe(2);
    expect((entry!.afterJson as { intervalS: number }).intervalS).toBe(5);
  });

  it('when a gateway password is rotated, then the old one stops matching and the new one matches', async () => {
    const before = (await Device.findByPk(ids.gateway))!.passwordHash;
    const res = await as('admin', 'post', `/api/plant-setup/gateways/${ids.gateway}/rotate`).send({ reason: 'Laptop with the old one lost' });
    expect(res.status).toBe(200);
    const after = (await Device.findByPk(ids.gateway))!.passwordHash;
    expect(after).not.toBe(before);
    expect(await bcrypt.compare(res.body.password, after)).toBe(true);
  });

  it('when a tank with a probe in service is retired, then 409; after its probe is retired, the tank is retired, kept, and gone from the Floor', async () => {
    expect((await as('admin', 'post', `/api/plant-setup/tanks/${ids.tank}/retire`).send({ reason: 'Decommissioned' })).status).toBe(409);
    expect((await as('engineer', 'post', `/api/plant-setup/probes/${ids.probe}/retire`).send({ reason: 'Tank emptied' })).status).toBe(200);
    expect((await as('admin', 'post', `/api/plant-setup/tanks/${ids.tank}/retire`).send({ reason: 'Decommissioned' })).status).toBe(200);
    expect((await Tank.findByPk(ids.tank))!.retiredAt).not.toBeNull();
    expect((await Probe.findByPk(ids.probe))!.active).toBe(false);
    const plant = await as('operator', 'get', '/api/plant');
    expect(plant.body.sites.find((s: { tag: string }) => s.tag === 'heron').circuits[0].tanks).toEqual([]);
    const setup = await as('operator', 'get', '/api/plant-setup');
    expect(setup.body.tanks.find((x: { id: number }) => x.id === ids.tank).retiredAt).toEqual(expect.any(String));
  });
});

describe('dead letters and conflicts', () => {
  const letter = (topic: string, payload: string, reason: string, receivedAtMs = Date.now()) =>
    ({ topic, payload: Buffer.from(payload), reason, receivedAtMs, gateway: 'heron-gw-1' });

  it('when the same bad message is stored three times, then one row is kept', async () => {
    const l = letter('ferrisight/v1/heron/H9/reading', '{"ts":1}', 'invalid reading: ts: ts must be ISO 8601 with Z or an offset');
    for (let i = 0; i < 3; i++) await inTransaction(pool, (conn) => insertDeadLetters(conn, [l, l]));
    const [{ n }] = await pool.query("SELECT COUNT(*) AS n FROM dead_letters WHERE topic = 'ferrisight/v1/heron/H9/reading'");
    expect(Number(n)).toBe(1);
  });

  it('when the screen asks for counts, then they equal the table\'s, with and without filters', async () => {
    await inTransaction(pool, (conn) => insertDeadLetters(conn, [
      letter('ferrisight/v1/heron/H1/reading', 'not json', 'invalid JSON: Unexpected token'),
      letter('ferrisight/v1/osprey/O1/reading', '{}', "device 'heron-gw-1' may publish only under ferrisight/v1/heron/"),
      { ...letter('ferrisight/v1/heron/batch', '{"probe":"H7","ts":"2026-12-01T00:00:00Z","orpMv":1,"tempC":1,"seq":1}', "readings[0]: unknown probe 'H7'"), gateway: null },
    ]));
    const table = async (where = '1 = 1', params: unknown[] = []) => Number((await pool.query(`SELECT COUNT(*) AS n FROM dead_letters WHERE ${where}`, params))[0].n);
    const screen = async (qs = '') => (await as('engineer', 'get', `/api/dead-letters${qs}`)).body;
    const all = await screen();
    expect(all.counts.deadLetters).toBe(await table());
    expect(all.counts.conflicts).toBe(Number((await pool.query('SELECT COUNT(*) AS n FROM reading_conflicts'))[0].n));
    expect((await screen('?site=heron')).counts.deadLetters).toBe(await table("site_tag = 'heron'"));
    expect((await screen('?kind=unknown-probe')).deadLetters.map((d: { probeTag: string }) => d.probeTag)).toEqual(['H7']);
    expect((await screen('?gateway=heron-gw-1&kind=forbidden-topic')).counts.deadLetters).toBe(1);
    const bad = await as('engineer', 'get', '/api/dead-letters?kind=nonsense&from=yesterday');
    expect(bad.status).toBe(400);
    expect(bad.body.errors.map((e: { path: string }) => e.path).sort()).toEqual(['from', 'kind']);
  });

  it('when retention runs, then dead letters and conflicts older than the setting are removed and newer ones kept', async () => {
    const old = Date.now() - 40 * 86_400_000;
    await inTransaction(pool, (conn) => insertDeadLetters(conn, [letter('ferrisight/v1/heron/H1/reading', 'old', 'invalid JSON: old', old)]));
    await pool.query(
      `INSERT INTO reading_conflicts (probe_id, ts, stored_orp_mv, stored_temp_c, incoming_orp_mv, incoming_temp_c, incoming_seq, source, received_at, fingerprint)
       VALUES (1, '2026-10-01 00:00:00', 1, 1, 2, 2, NULL, 'mqtt', ?, UNHEX(SHA2('old-conflict', 256)))`, [new Date(old).toISOString().replace('T', ' ').replace('Z', '')]);
    const before = Number((await pool.query('SELECT COUNT(*) AS n FROM dead_letters'))[0].n);
    const removed = await deleteExpiredRefusals(pool, 30, logger);
    expect(removed).toEqual({ deadLetters: 1, conflicts: 1 });
    expect(Number((await pool.query('SELECT COUNT(*) AS n FROM dead_letters'))[0].n)).toBe(before - 1);
  });
});

describe('first run of a real site', () => {
  it('when the database has no users, then the one-time link creates the first admin once, and the admin signs in', async () => {
    const db = await createTestDatabase();
    const sequelize = createSequelize(db.databaseUrl, 2);
    initModels(sequelize);
    try {
      const app = createApp({ auth: createAuthService({ jwtSecret: TEST_SECRET, ttlS: 3600 }), ttlS: 3600 });
      const post = (body: object) => request(app).post('/api/first-run').set('X-Ferrisight-Csrf', '1').send(body);
      expect((await request(app).get('/api/first-run')).body).toEqual({ needed: true });
      const token = (await firstRunRepository.issueToken(sequelize))!;
      const admin = { email: 'first@heron.example', name: 'First Admin', password: 'a long first passphrase' };
      expect((await post({ ...admin, token: 'x'.repeat(32) })).status).toBe(403);
      expect((await post({ ...admin, token, email: 'nope' })).status).toBe(400);
      expect((await post({ ...admin, token })).status).toBe(201);
      await signIn(app, admin.email, admin.password);
      expect((await post({ ...admin, email: 'second@heron.example', token })).status).toBe(403);
      expect((await request(app).get('/api/first-run')).body).toEqual({ needed: false });
      expect(await firstRunRepository.issueToken(sequelize)).toBeNull();
    } finally {
      await sequelize.close();
      initModels(t.sequelize);
      await db.drop();
    }
  });
});
