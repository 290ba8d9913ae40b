import fs from 'node:fs';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { fingerprint, importFile, removeTempFiles, tempDir, writeReadingsFile } from './import-helpers.ts';

let t: TestApi;
const TAGS = ['A1-ORP', 'A2-ORP', 'A3-ORP', 'A4-ORP', 'A5-ORP', 'A6-ORP', 'B1-ORP', 'B2-ORP', 'B3-ORP', 'B4-ORP'];
const DAY = 86_400_000;
// Demo calibrations are valid from 20 days ago; start well inside that and on a whole hour.
const START = Math.floor((Date.now() - 10 * DAY) / 3_600_000) * 3_600_000;

beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => {
  removeTempFiles();
  await t?.close();
});

const tmpFile = (name: string, text: string) => {
  const file = path.join(tempDir(), name);
  fs.writeFileSync(file, text);
  return file;
};

describe('historical import', () => {
  it('when 100 000 rows are imported, then all are stored, rollups follow, and a re-import changes nothing', async () => {
    const file = await writeReadingsFile(100_000, TAGS, START);
    const started = performance.now();
    const job = await importFile(t, file);
    const seconds = (performance.now() - started) / 1000;
    expect(job).toMatchObject({ status: 'done', rowsRead: 100_000, stored: 100_000, duplicates: 0, conflicts: 0, rejected: 0 });
    expect(job.bytesRead).toBe(fs.statSync(file).size);
    const after = await fingerprint(t);
    expect(after).toMatchObject({ readings: 100_000, minuteN: 100_000, hourN: 100_000 });
    // 10 000 readings per probe, 12 a minute from a whole hour: 834 minutes and 14 hours each.
    expect(after.minutes).toBe(10 * 834);
    expect(after.hours).toBe(10 * 14);
    process.stdout.write(`import of 100 000 rows: ${seconds.toFixed(1)} s, ${Math.round(100_000 / seconds)} rows/s\n`);

    const again = await importFile(t, file);
    expect(again).toMatchObject({ status: 'done', stored: 0, duplicates: 100_000, conflicts: 0, rejected: 0 });
    expect(await fingerprint(t)).toEqual(after);
  }, 300_000);

  it('when an imported reading differs from a stored one, then the stored value stays and the conflict is recorded', async () => {
    const ts = new Date(START).toISOString();
    const file = tmpFile('conflict.csv', `probe,time,orp_mv,temp_c\nA1-ORP,${ts},999.5,42\n`);
    const job = await importFile(t, file);
    expect(job).toMatchObject({ stored: 0, duplicates: 0, conflicts: 1 });
    const rows = await t.sequelize.query(`SELECT c.incoming_orp_mv AS incoming, c.source FROM reading_conflicts c JOIN probes p ON p.id = c.probe_id WHERE p.tag = 'A1-ORP'`, { type: QueryTypes.SELECT });
    expect(rows).toEqual([{ incoming: 999.5, source: `import:${job.id}:conflict.csv` }]);
  });

  it('when readings span a calibration change, then each is converted with the calibration valid at its time', async () => {
    const [a6] = await t.sequelize.query<{ tankId: number }>(`SELECT tank_id AS tankId FROM probes WHERE tag = 'A6-ORP'`, { type: QueryTypes.SELECT });
    const change = START - 2 * DAY;
    await t.sequelize.query(`INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_at)
      VALUES (${a6.tankId}, 2, 0.700, 0.0009, '${new Date(change).toISOString().slice(0, 23).replace('T', ' ')}', 'test', NOW(3))`);
    const before = new Date(change - 60_000).toISOString();
    const after = new Date(change + 60_000).toISOString();
    await importFile(t, tmpFile('cal.csv', `probe,time,orp_mv,temp_c\nA6-ORP,${before},450,42\nA6-ORP,${after},450,42\n`));
    const rows = await t.sequelize.query<{ v: number; ratio: number }>(`SELECT r.calibration_version AS v, r.ratio FROM readings r JOIN probes p ON p.id = r.probe_id
      WHERE p.tag = 'A6-ORP' AND r.ts IN ('${before.slice(0, 23).replace('T', ' ')}', '${after.slice(0, 23).replace('T', ' ')}') ORDER BY r.ts`, { type: QueryTypes.SELECT });
    expect(rows.map((r) => r.v)).toEqual([1, 2]);
    // Same ORP, higher formal potential: a lower ratio (Nernst, 16 mV higher E°′ ≈ ×0.53 at 42 °C).
    expect(rows[1].ratio).toBeLessThan(rows[0].ratio * 0.6);
  });

  it('when a file has bad rows, then each is reported by line with its reason and the good ones are stored', async () => {
    const ok = new Date(START + DAY).toISOString();
    const lines = [
      'probe,time,orp_mv,temp_c',
      `B1-ORP,${ok},120,80`,
      `NOPE-ORP,${ok},120,80`,
      'B1-ORP,yesterday,120,80',
      `B1-ORP,${ok.replace('Z', '')},120,80`,
      `B1-ORP,${new Date(START + DAY + 5000).toISOString()},2500,80`,
      `B1-ORP,${new Date(START + DAY + 10_000).toISOString()},120,`,
      `B1-ORP,${new Date(Date.now() - 30 * DAY).toISOString()},120,80`,
      `B1-ORP,${new Date(Date.now() + DAY).toISOString()},120,80`,
      `=HYPERLINK("http://x"),${ok},1,2`,
      `B1-ORP,${new Date(START + DAY + 15_000).toISOString()},120.5,79.5`,
    ];
    const job = await importFile(t, tmpFile('bad.csv', lines.join('\r\n')));
    expect(job).toMatchObject({ status: 'done', rowsRead: 10, stored: 2, rejected: 8 });
    const res = await request(t.app).get(`/api/readings/imports/${job.id}/rejections`).set('Cookie', t.cookies.metallurgist);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const out = res.text.trim().split('\r\n');
    expect(out[0]).toBe('line,reason,content');
    const byLine = new Map(out.slice(1).map((l) => [Number(l.split(',')[0]), l]));
    expect([...byLine.keys()]).toEqual([3, 4, 5, 6, 7, 8, 9, 10]);
    expect(byLine.get(3)).toContain("unknown probe 'NOPE-ORP'");
    expect(byLine.get(4)).toContain('ts must be ISO 8601');
    expect(byLine.get(5)).toContain('ts must be ISO 8601');
    expect(byLine.get(6)).toContain('orpMv must be ≤ 2000 mV');
    expect(byLine.get(7)).toContain('tempC');
    expect(byLine.get(8)).toMatch(/no calibration .* was valid/);
    expect(byLine.get(9)).toContain('in the future');
    // A formula in a cell is written back with a leading apostrophe, never as a live formula.
    expect(byLine.get(10)).toContain(`"'=HYPERLINK(""http://x""),`);
  });

  it('when the header does not name the columns, then the job fails saying which are missing', async () => {
    const job = await importFile(t, tmpFile('nohead.csv', 'A1-ORP,2026-01-01T00:00:00Z,450,42\n'));
    expect(job.status).toBe('failed');
    expect(job.error).toContain('missing: probe, time, orpMv, tempC');
  });

  it('when someone other than a metallurgist or admin imports, then it is refused; without a file it is a 400', async () => {
    // The role is checked before the upload is read; a body-less request avoids racing the early 403 against the upload (EPIPE).
    for (const role of ['operator', 'supervisor', 'engineer'] as const) {
      const res = await request(t.app).post('/api/readings/imports').set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send({});
      expect(res.status).toBe(403);
      expect((await request(t.app).get('/api/readings/imports').set('Cookie', t.cookies[role])).status).toBe(403);
    }
    const none = await request(t.app).post('/api/readings/imports').set('Cookie', t.cookies.admin).set('X-Ferrisight-Csrf', '1').field('x', '1');
    expect(none.status).toBe(400);
    const list = await request(t.app).get('/api/readings/imports').set('Cookie', t.cookies.admin);
    expect(list.status).toBe(200);
    expect(Array.isArray(list.body.jobs)).toBe(true);
  });
});

describe.runIf(process.env.FERRISIGHT_LONG === '1')('historical import, long run', () => {
  it('when a 1 000 000-row file is imported, then it completes and reports its figures', async () => {
    const file = await writeReadingsFile(1_000_000, TAGS, START - 8 * DAY);
    const started = performance.now();
    const job = await importFile(t, file, 'admin', 1_800_000);
    const seconds = (performance.now() - started) / 1000;
    process.stdout.write(`import of 1 000 000 rows: ${seconds.toFixed(1)} s, ${Math.round(1_000_000 / seconds)} rows/s\n`);
    expect(job).toMatchObject({ status: 'done', rowsRead: 1_000_000, stored: 1_000_000, rejected: 0 });
  }, 1_900_000);
});
