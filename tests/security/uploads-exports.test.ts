/**
 * Uploads and exports: oversized, wrong type and path-like file
 * names on the two upload routes (assay CSV, historical readings import), and CSV formula
 * injection (OWASP "CSV Injection": cells starting with = + - @ tab CR) in the readings export,
 * the import rejections and the one CSV writer itself (tests/security/csv-exports.test.ts covers
 * every export route).
 */
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import fc from 'fast-check';
import { parse } from 'csv-parse/sync';
import type { Express } from 'express';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/src/app.ts';
import { csvText } from '../../api/src/lib/csv.ts';
import { ASSAY_CSV_MAX_BYTES } from '../../shared/schemas/assays.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
let app: Express;
const dataDir = mkdtempSync(path.join(os.tmpdir(), 'fs-uploads-'));
const FORMULA = /^[=+\-@\t\r]/;

beforeAll(async () => {
  t = await createTestApi();
  // Same auth (so the seeded cookies work), uploads into a folder of this test's own.
  app = createApp({ auth: t.auth, ttlS: 3600, dataDir });
});
afterAll(async () => {
  await t?.close();
  rmSync(dataDir, { recursive: true, force: true });
});

const post = (p: string) => request(app).post(p).set('Cookie', t.cookies.metallurgist).set('X-Ferrisight-Csrf', '1');
const PNG = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d4944415478da63f8ffff3f0005fe02fea7d6a4c50000000049454e44ae426082', 'hex');

async function importJob(csv: string | Buffer, filename: string): Promise<{ id: number; status: string; rejected: number; fileName: string }> {
  const res = await post('/api/readings/imports').attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv), filename);
  expect(res.status, JSON.stringify(res.body)).toBe(202);
  const id = res.body.job.id as number;
  for (let i = 0; i < 100; i += 1) {
    const job = (await request(app).get(`/api/readings/imports/${id}`).set('Cookie', t.cookies.metallurgist)).body.job;
    if (job.status === 'done' || job.status === 'failed') return job;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`import ${id} did not finish`);
}

describe('uploads', () => {
  it('when an assay CSV is larger than the limit, then 413 and nothing is stored', async () => {
    const res = await post('/api/assays/csv/preview').attach('file', Buffer.alloc(ASSAY_CSV_MAX_BYTES + 1, 0x41), 'big.csv');
    expect(res.status).toBe(413);
  });

  it('when an assay upload is an image, JSON instead of a file, or two files, then 4xx, never 500', async () => {
    const png = await post('/api/assays/csv/preview').attach('file', PNG, 'photo.png');
    const json = await post('/api/assays/csv/preview').send({ file: 'x' });
    const two = await post('/api/assays/csv/preview').attach('file', Buffer.from('a'), 'a.csv').attach('file', Buffer.from('b'), 'b.csv');
    for (const r of [png, json, two]) expect(r.status, JSON.stringify(r.body)).toBeGreaterThanOrEqual(400);
    for (const r of [png, json, two]) expect(r.status).toBeLessThan(500);
  });

  it('when an assay file name is path-like, then only a cleaned base name is ever echoed or kept', async () => {
    for (const name of ['../../../../etc/passwd.csv', '..\\..\\windows\\win.ini.csv', '/abs/olute.csv', '%2e%2e%2fx.csv']) {
      const res = await post('/api/assays/csv/preview').attach('file', Buffer.from('tank,time\n'), name);
      expect(res.status).toBeLessThan(500);
      expect(JSON.stringify(res.body)).not.toMatch(/\.\.[\\/]|\/etc\/|\\windows\\|\/abs\//);
    }
  });

  it('when a multipart body is malformed (a NUL in the file name), then both upload routes answer 400, not 500', async () => {
    const bad = Buffer.from('tank,time\n');
    const assays = await post('/api/assays/csv/preview').attach('file', bad, 'a\u0000b.csv');
    const imports = await post('/api/readings/imports').attach('file', bad, 'a\u0000b.csv');
    expect([assays.status, imports.status]).toEqual([400, 400]);
  });

  it('when an import file name is path-like, then the file lands under uploads with a generated name and nowhere else', async () => {
    const target = path.join(dataDir, 'escaped.csv');
    const job = await importJob('probe,time,orp,temp\n', `../${path.basename(target)}`);
    expect(existsSync(target)).toBe(false);
    expect(readdirSync(path.join(dataDir, 'uploads')).every((f) => /^import-\d+-[0-9a-f]+\.csv$/.test(f))).toBe(true);
    console.log(`import with a path-like name: stored under uploads/ with a generated name; recorded name ${JSON.stringify(job.fileName)}`);
  });

  it('when an import is an image, then the job fails or rejects rows with a reason and the server stays up', async () => {
    const job = await importJob(PNG, 'photo.csv');
    expect(job.status === 'failed' || job.rejected > 0).toBe(true);
    expect((await request(app).get('/api/health')).status).toBe(200);
  });
});

describe('CSV formula injection', () => {
  it('when tank and probe tags look like formulas, then the readings export escapes them and keeps numbers as numbers', async () => {
    const [c] = await t.sequelize.query<{ id: number }>('SELECT id FROM circuits ORDER BY id LIMIT 1', { type: QueryTypes.SELECT });
    const now = new Date();
    const [tankId] = await t.sequelize.query(
      "INSERT INTO tanks (circuit_id, tag, name, position, volume_m3, band_low, band_high, created_at, updated_at) VALUES (?, '=HYPERLINK(\"http://evil.example\")', 'x', 99, 1, 1, 2, ?, ?)",
      { replacements: [c.id, now, now], type: QueryTypes.INSERT });
    const [probeId] = await t.sequelize.query(
      `INSERT INTO probes (tank_id, tag, reference_id, reference_e25_v, reference_coeff_v_per_k, tolerance_mv, interval_s, installed_at, active, created_at, updated_at)
       VALUES (?, '@SUM(1+1)', 'agcl-3m', 0.21, -0.0007, 10, 5, ?, 1, ?, ?)`, { replacements: [tankId, now, now, now], type: QueryTypes.INSERT });
    await t.sequelize.query(
      "INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES (?, ?, 1, -12.5, 40, 0.2, 1, 0.5, 'ok', 1, ?)",
      { replacements: [probeId, new Date(now.getTime() - 60_000), now] });
    const res = await request(app).get('/api/readings/export').set('Cookie', t.cookies.operator)
      .query({ tankIds: String(tankId), from: new Date(now.getTime() - 3_600_000).toISOString(), to: now.toISOString(), source: 'raw' });
    expect(res.status).toBe(200);
    const rows: string[][] = parse(res.text);
    expect(rows[1][0]).toBe('\'=HYPERLINK("http://evil.example")');
    expect(rows[1][1]).toBe("'@SUM(1+1)");
    expect(rows[1][3]).toBe('-12.5');
  });

  it('when rejected import rows hold formulas, then the rejections CSV escapes every such cell', async () => {
    const job = await importJob('probe,time,orp,temp\n=cmd|\' /C calc\'!A0,2026-01-01T00:00:00Z,1,1\n+1+1,x,y,z\n-2+3,,,\n@SUM(A1),,,\n', 'evil.csv');
    expect(job.rejected).toBe(4);
    const res = await request(app).get(`/api/readings/imports/${job.id}/rejections`).set('Cookie', t.cookies.metallurgist);
    const cells = (parse(res.text) as string[][]).slice(1).flat();
    expect(cells.filter((x) => FORMULA.test(x))).toEqual([]);
    expect(cells.some((x) => x.startsWith("'=cmd"))).toBe(true);
  });

  it('when any text starts like a formula, then the one CSV writer escapes it; numbers stay numbers', () => {
    fc.assert(fc.property(fc.constantFrom('=', '+', '-', '@', '\t', '\r', '\uFF1D'), fc.string(), (lead, rest) => {
      const [, [cell]] = parse(csvText([['h'], [lead + rest]]), { relax_column_count: true }) as string[][];
      return cell!.startsWith("'");
    }), { numRuns: 2_000 });
    expect(csvText([['h'], [-12.5]])).toBe('h\r\n-12.5\r\n');
  });
});
