/**
 * Every CSV export route, with a formula in every text field that reaches it (OWASP "CSV
 * Injection", owasp.org/www-community/attacks/CSV_Injection): a cell a spreadsheet would run
 * starts with = + - @, a tab or a carriage return. Each route is fetched as a browser would,
 * parsed with csv-parse, and no cell may start that way unless it is a number; the text itself
 * must survive behind the leading apostrophe OWASP advises.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parse } from 'csv-parse/sync';
import type { Express } from 'express';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { rawPool } from '../../api/src/db/database.ts';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { insertDeadLetters } from '../../api/src/modules/readings/dead-letters.repository.ts';
import { ROLES, type Role } from '../../shared/schemas/auth.ts';
import { DIGEST_TABLES } from '../../shared/schemas/digest.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

/** The OWASP list of formula starts, one payload each. Tab and CR only where nothing trims them (direct SQL). */
const FORMULAS = ['=HYPERLINK("http://x","y")', '+1+1', '-2+3', '@SUM(A1)', '\t=1+1', '\r=1+1'] as const;
const TRIMMED = FORMULAS.slice(0, 4);
const STARTS_FORMULA = /^[=+\-@\t\r]/;
const isNumber = (cell: string) => cell.trim() !== '' && Number.isFinite(Number(cell)) && !/^[\t\r]/.test(cell);

let t: TestApi;
let app: Express;
const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-csv-exports-'));
const planted = {} as {
  siteTag: string; circuitTag: string; tankTag: string; tankName: string; probeTag: string; names: Record<Role, string>;
  tankId: number; probeId: number; logBody: string; bandReason: string; assayMethod: string; calibrationReason: string; email: string;
};
const from = new Date(Date.now() - 3 * 3_600_000).toISOString();
const to = () => new Date(Date.now() + 60_000).toISOString();

const sql = (q: string, replacements: unknown[] = []) => t.sequelize.query(q, { replacements });
const one = async <T extends object>(q: string, replacements: unknown[] = []) =>
  (await t.sequelize.query<T>(q, { replacements, type: QueryTypes.SELECT }))[0]!;
const send = (role: Role, method: 'post' | 'put' | 'patch', url: string, body: object) =>
  request(app)[method](url).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body);

/** Fetches a CSV export as `role`, parses it, and returns header and data rows. */
async function fetchCsv(role: Role, url: string, query: Record<string, string | number> = {}): Promise<{ header: string[]; rows: string[][]; text: string }> {
  const res = await request(app).get(url).query(query).set('Cookie', t.cookies[role]).buffer(true);
  expect(res.status, res.text).toBe(200);
  expect(res.headers['content-type']).toMatch(/^text\/csv/);
  expect(res.headers['content-disposition']).toMatch(/^attachment; filename="?[\w.-]+\.csv"?$/);
  const [header, ...rows] = parse(res.text, { bom: true }) as string[][];
  return { header: header!, rows, text: res.text };
}

/** No cell starts a formula unless it is a number (numbers stay numbers: a negative mV still sorts). */
function expectNoFormula(csv: { header: string[]; rows: string[][] }) {
  const bad = [csv.header, ...csv.rows].flat().filter((c) => STARTS_FORMULA.test(c) && !isNumber(c));
  expect(bad).toEqual([]);
}

/** Each planted text comes back whole, behind one apostrophe. */
function expectEscaped(csv: { rows: string[][] }, values: string[]) {
  const cells = new Set(csv.rows.flat());
  for (const v of values) expect(cells.has(`'${v}`), `'${JSON.stringify(v)}' not found escaped`).toBe(true);
}

beforeAll(async () => {
  t = await createTestApi();
  // Same auth (the seeded cookies work); uploads into a folder of this test's own.
  app = createApp({ auth: t.auth, ttlS: 3600, dataDir });
  const tank = await one<{ tankId: number; probeId: number; circuitId: number; siteId: number; low: number; high: number }>(
    `SELECT t.id AS tankId, p.id AS probeId, c.id AS circuitId, c.site_id AS siteId, t.band_low AS low, t.band_high AS high
       FROM tanks t JOIN probes p ON p.tank_id = t.id AND p.active = 1 JOIN circuits c ON c.id = t.circuit_id ORDER BY c.site_id, t.id LIMIT 1`);
  Object.assign(planted, {
    tankId: tank.tankId, probeId: tank.probeId,
    siteTag: `${FORMULAS[0]} s`, circuitTag: `${FORMULAS[1]} c`, tankTag: `${FORMULAS[3]} t`, tankName: `${FORMULAS[4]} tank`, probeTag: `${FORMULAS[5]} p`,
    names: Object.fromEntries(ROLES.map((r, i) => [r, `${FORMULAS[i % FORMULAS.length]} ${r}`])) as Record<Role, string>,
    logBody: `${TRIMMED[2]} log`, bandReason: `${TRIMMED[0]} band`, assayMethod: `${TRIMMED[3]} method`, calibrationReason: `${FORMULAS[5]} refit`, email: '=admin@test.example',
  });
  // Names and tags straight into the tables: a tab or CR at the start survives only there.
  await sql('UPDATE sites SET tag = ?, name = ? WHERE id = ?', [planted.siteTag, FORMULAS[2], tank.siteId]);
  await sql('UPDATE circuits SET tag = ?, name = ? WHERE id = ?', [planted.circuitTag, FORMULAS[3], tank.circuitId]);
  await sql('UPDATE tanks SET tag = ?, name = ? WHERE id = ?', [planted.tankTag, planted.tankName, tank.tankId]);
  await sql('UPDATE probes SET tag = ? WHERE id = ?', [planted.probeTag, tank.probeId]);
  for (const r of ROLES) await sql('UPDATE users SET name = ? WHERE id = ?', [planted.names[r], t.users[r]]);
  await sql('UPDATE users SET email = ? WHERE id = ?', [planted.email, t.users.admin]);

  // Through the routes people use: a log entry, a band change, an assay, a probe check, an acknowledged alarm.
  expect((await send('operator', 'post', '/api/shift-log/entries', { body: planted.logBody, tankId: tank.tankId })).status).toBe(201);
  const band = await send('metallurgist', 'put', `/api/bands/${tank.tankId}`, { low: tank.low * 1.1, high: tank.high * 1.1, target: null, reason: planted.bandReason });
  expect(band.status, band.text).toBeLessThan(300);
  const assay = await send('metallurgist', 'post', '/api/assays', {
    tankId: tank.tankId, sampledAt: new Date(Date.now() - 10 * 60_000).toISOString(), fe2: 1, feTotal: 3, unit: 'g/L', method: planted.assayMethod, note: TRIMMED[1],
  });
  expect(assay.status, assay.text).toBe(201);
  const check = await send('metallurgist', 'post', '/api/probe-checks', { probeId: tank.probeId, standard: 'zobell', tempC: 25, readingMv: 200 });
  expect(check.status, check.text).toBe(201);
  // A calibration as the workbench records it (its fit needs assays; the row is what the digest reads).
  await sql(`INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_by, created_at)
    VALUES (?, 99, 0.69, 0.0009, ?, ?, ?, ?)`, [tank.tankId, new Date(Date.now() - 30 * 60_000), planted.calibrationReason, t.users.engineer, new Date(Date.now() - 30 * 60_000)]);
  const def = await one<{ id: number }>('SELECT id FROM alarm_definitions WHERE tank_id = ? ORDER BY id LIMIT 1', [tank.tankId]);
  const act = await applyAction(t.sequelize, { definitionId: def.id, action: 'activate', at: new Date(Date.now() - 60_000), actor: { userId: null, name: null, how: 'automatic' } });
  expect(act.ok).toBe(true);
  const ack = await send('supervisor', 'post', `/api/alarms/instances/${(act as { instanceId: number }).instanceId}/acknowledge`, { comment: TRIMMED[2] });
  expect(ack.status, ack.text).toBe(200);
}, 120_000);

afterAll(async () => {
  await t?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

describe('every CSV export escapes formulas in every text column (OWASP "CSV Injection")', () => {
  it('when site, circuit and tank tags and the acknowledging person\'s name are formulas, then the alarm history CSV escapes each', async () => {
    const csv = await fetchCsv('operator', '/api/alarms/history/export', { from, to: to() });
    expect(csv.rows.length).toBeGreaterThan(0);
    expectNoFormula(csv);
    expectEscaped(csv, [planted.siteTag, planted.circuitTag, planted.tankTag, planted.names.supervisor]);
  });

  it('when tank and probe tags are formulas, then the readings CSV escapes them and a negative ORP stays a number', async () => {
    const at = new Date(Date.now() - 5 * 60_000);
    await sql(
      "INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES (?, ?, 1, -12.5, 40, 0.2, 1, 0.5, 'ok', 1, ?)",
      [planted.probeId, at, at]);
    const csv = await fetchCsv('operator', '/api/readings/export', { tankIds: String(planted.tankId), from, to: to(), source: 'raw' });
    expectNoFormula(csv);
    expectEscaped(csv, [planted.tankTag, planted.probeTag]);
    expect(csv.rows.map((r) => r[csv.header.indexOf('orp_mv')])).toContain('-12.5');
  });

  it('when tags, names, the log, band and calibration reasons, an assay method and a probe tag are formulas, then every digest table CSV escapes them', async () => {
    const cells: string[][] = [];
    for (const table of DIGEST_TABLES) {
      const csv = await fetchCsv('supervisor', '/api/digest/export', { table, from, to: to() });
      expect(csv.rows.length, table).toBeGreaterThan(0);
      expectNoFormula(csv);
      cells.push(...csv.rows);
    }
    const all = { rows: cells };
    expectEscaped(all, [planted.tankTag, planted.tankName, planted.circuitTag, planted.names.operator, planted.names.metallurgist, planted.names.engineer, planted.logBody]);
    // Texts quoted inside a summary sentence are not at the start of a cell, and stay as written.
    const flat = cells.flat().join('\n');
    for (const v of [planted.bandReason, planted.assayMethod, planted.calibrationReason]) expect(flat).toContain(v);
    expect(flat).toContain(`'${planted.probeTag} in zobell standard`);
  });

  it('when a dead letter\'s topic, payload, reason, gateway, site and probe are formulas, then the dead-letter CSV escapes each', async () => {
    const letters = FORMULAS.map((f, i) => ({ topic: `${f}/topic${i}`, payload: Buffer.from(`${FORMULAS[(i + 1) % 6]} payload`), reason: `${FORMULAS[(i + 2) % 6]} reason`, receivedAtMs: Date.now() - 60_000, gateway: `${FORMULAS[(i + 3) % 6]} gw` }));
    const conn = await rawPool(t.sequelize).getConnection();
    try {
      await insertDeadLetters(conn, letters);
    } finally {
      await conn.release();
    }
    await sql('UPDATE dead_letters SET site_tag = ?, probe_tag = ? WHERE topic = ?', [FORMULAS[4], FORMULAS[5], letters[0]!.topic]);
    const csv = await fetchCsv('engineer', '/api/dead-letters/export', { from, to: to() });
    expect(csv.rows).toHaveLength(FORMULAS.length);
    expectNoFormula(csv);
    expectEscaped(csv, [...letters.flatMap((l) => [l.topic, l.payload.toString(), l.reason, l.gateway]), FORMULAS[4], FORMULAS[5]]);
    expect(csv.rows.map((r) => r[csv.header.indexOf('payload_bytes')])).toContain(String(letters[0]!.payload.length));

    // Conflicts, the screen's other table: site and probe tags from the plant, the sender as recorded.
    const at = new Date(Date.now() - 120_000);
    await sql(`INSERT INTO reading_conflicts (probe_id, ts, stored_orp_mv, stored_temp_c, incoming_orp_mv, incoming_temp_c, incoming_seq, source, received_at, fingerprint)
      VALUES (?, ?, -101.5, 40, -99, 40, 7, ?, ?, RANDOM_BYTES(32))`, [planted.probeId, at, `${FORMULAS[3]} sender`, at]);
    const conflicts = await fetchCsv('engineer', '/api/dead-letters/export', { table: 'conflicts', from, to: to() });
    expect(conflicts.rows).toHaveLength(1);
    expectNoFormula(conflicts);
    expectEscaped(conflicts, [planted.siteTag, planted.probeTag, `${FORMULAS[3]} sender`]);
    expect(conflicts.rows[0]![conflicts.header.indexOf('stored_orp_mv')]).toBe('-101.5');
  });

  it('when a change\'s reason, the new value and the person\'s name and e-mail are formulas, then the audit trail CSV escapes each', async () => {
    const patch = await send('admin', 'patch', `/api/plant-setup/tanks/${planted.tankId}`, { name: TRIMMED[1], reason: TRIMMED[0] });
    expect(patch.status, patch.text).toBe(200);
    const csv = await fetchCsv('admin', '/api/audit/export', { entity: 'tank', from, to: to() });
    expectNoFormula(csv);
    expectEscaped(csv, [TRIMMED[0], planted.names.admin, planted.email]);
    const row = csv.rows.find((r) => r[csv.header.indexOf('reason')] === `'${TRIMMED[0]}`)!;
    expect(JSON.parse(row[csv.header.indexOf('after_json')]!)).toMatchObject({ name: TRIMMED[1] });
    // Band reasons, assays and log edits are in the same trail; unfiltered, every row is still safe.
    expectNoFormula(await fetchCsv('admin', '/api/audit/export'));
  });

  it('when the first tank\'s tag is a formula, then the assay template CSV that names it escapes it', async () => {
    expect((await one<{ id: number }>('SELECT MIN(id) AS id FROM tanks WHERE retired_at IS NULL')).id).toBe(planted.tankId);
    const csv = await fetchCsv('operator', '/api/assays/template.csv');
    expectNoFormula(csv);
    expect(csv.rows.map((r) => r[0])).toEqual([`'${planted.tankTag}`, `'${planted.tankTag}`]);
  });

  it('when every field of an imported file is a formula, then the import rejections CSV escapes each rejected line and reason', async () => {
    const lines = ['probe,time,orp,temp', ...TRIMMED.map((f, i) => [f, TRIMMED[(i + 1) % 4], TRIMMED[(i + 2) % 4], TRIMMED[(i + 3) % 4]].map((c) => `"${c.replace(/"/g, '""')}"`).join(','))];
    const up = await request(app).post('/api/readings/imports').set('Cookie', t.cookies.metallurgist).set('X-Ferrisight-Csrf', '1')
      .attach('file', Buffer.from(`${lines.join('\n')}\n`), 'formulas.csv');
    expect(up.status, up.text).toBe(202);
    let job = up.body.job as { id: number; status: string; rejected: number };
    for (let i = 0; i < 100 && job.status !== 'done' && job.status !== 'failed'; i += 1) {
      await new Promise((r) => setTimeout(r, 100));
      job = (await request(app).get(`/api/readings/imports/${job.id}`).set('Cookie', t.cookies.metallurgist)).body.job;
    }
    expect(job.rejected).toBe(TRIMMED.length);
    const csv = await fetchCsv('metallurgist', `/api/readings/imports/${job.id}/rejections`);
    expectNoFormula(csv);
    for (const f of TRIMMED) expect(csv.rows.some((r) => r[csv.header.indexOf('content')]!.startsWith(`'${f}`))).toBe(true);
  });
});

describe('new export routes: filters and bad input', () => {
  it('when the dead-letter export is filtered by gateway, then only that gateway\'s letters come back', async () => {
    const csv = await fetchCsv('admin', '/api/dead-letters/export', { gateway: `${FORMULAS[3]} gw` });
    expect(csv.rows.map((r) => r[csv.header.indexOf('gateway')])).toEqual([`'${FORMULAS[3]} gw`]);
  });

  it('when the audit trail is filtered by action and person, then the screen\'s list and the CSV hold the same entries', async () => {
    expect((await send('admin', 'patch', `/api/plant-setup/tanks/${planted.tankId}`, { volumeM3: 12, reason: 'Volume re-measured' })).status).toBe(200);
    const query = { action: 'tank', userId: t.users.admin };
    const list = await request(app).get('/api/audit').query(query).set('Cookie', t.cookies.admin);
    expect(list.status).toBe(200);
    expect(list.body.total).toBeGreaterThan(0);
    expect(list.body.entries.every((e: { action: string; user: { id: number } }) => e.action.startsWith('tank.') && e.user.id === t.users.admin)).toBe(true);
    const csv = await fetchCsv('admin', '/api/audit/export', query);
    expect(csv.rows.map((r) => Number(r[0]))).toEqual(list.body.entries.map((e: { id: number }) => e.id));
    // 'tank' is a prefix of actions only at a dot: 'tanker.x' would not match.
    const none = await request(app).get('/api/audit').query({ action: 'tan' }).set('Cookie', t.cookies.admin);
    expect(none.body.total).toBe(0);
  });

  it.each([
    ['/api/dead-letters/export', { kind: 'nope' }, 'kind'],
    ['/api/dead-letters/export', { table: 'users' }, 'table'],
    ['/api/dead-letters/export', { from: '2026-12-04T10:00:00Z', to: '2026-12-04T09:00:00Z' }, 'from'],
    ['/api/audit/export', { userId: 'x' }, 'userId'],
    ['/api/audit', { limit: 0 }, 'limit'],
    ['/api/digest/export', { table: 'secrets' }, 'table'],
    ['/api/digest/export', { table: 'tanks', from: 'yesterday', to: 'today' }, 'from'],
  ])('when %s gets a bad query %o, then 400 problem+json names the field', async (url, query, field) => {
    const res = await request(app).get(url).query(query).set('Cookie', t.cookies.admin);
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(JSON.stringify(res.body.errors)).toContain(field);
  });
});
