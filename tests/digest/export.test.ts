import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { csvText } from '../../api/src/lib/csv.ts';
import { RAW_EXPORT_COLUMNS, ROLLUP_EXPORT_COLUMNS } from '../../shared/schemas/export.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import fs from 'node:fs';
import path from 'node:path';
import { importFile, removeTempFiles, tempDir } from './import-helpers.ts';

let t: TestApi;
let b1: number;
let a1: number;
const START = Math.floor((Date.now() - 3 * 86_400_000) / 3_600_000) * 3_600_000;
const iso = (ms: number) => new Date(ms).toISOString();

beforeAll(async () => {
  t = await createTestApi();
  const plant = (await request(t.app).get('/api/plant').set('Cookie', t.cookies.operator)).body;
  a1 = plant.sites[0].circuits[0].tanks[0].id;
  b1 = plant.sites[0].circuits[1].tanks[0].id;
  // Two minutes of B1 every 5 s (one negative ORP), one reading of A1, through the import so rollups exist.
  const lines = ['probe,time,orp_mv,temp_c'];
  for (let i = 0; i < 24; i += 1) lines.push(`B1-ORP,${iso(START + i * 5000)},${i === 3 ? -12.5 : 100 + i},80.5`);
  lines.push(`A1-ORP,${iso(START)},450,42`);
  const file = path.join(tempDir(), 'seed.csv');
  fs.writeFileSync(file, lines.join('\n'));
  const job = await importFile(t, file);
  if (job.stored !== 25) throw new Error(`seed import stored ${job.stored}: ${job.error}`);
});
afterAll(async () => {
  removeTempFiles();
  await t?.close();
});

const exportCsv = (q: string) => request(t.app).get(`/api/readings/export?${q}`).set('Cookie', t.cookies.operator);
const rows = (text: string) => text.trim().split('\r\n').map((l) => l.split(','));

describe('readings export', () => {
  it('when raw readings are exported, then the header names each column with its unit and rows follow in time order', async () => {
    const res = await exportCsv(`tankIds=${b1},${a1}&source=raw&from=${iso(START)}&to=${iso(START + 3_600_000)}`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="?ferrisight-readings-raw-/);
    const [header, ...data] = rows(res.text);
    expect(header).toEqual([...RAW_EXPORT_COLUMNS]);
    expect(header).toEqual(expect.arrayContaining(['orp_mv', 'temp_c', 'eh_v']));
    expect(data).toHaveLength(25);
    const b = data.filter((r) => r[0] === 'B1');
    expect(b[0].slice(0, 5)).toEqual(['B1', 'B1-ORP', iso(START), '100', '80.5']);
    // A negative number is data, not a formula: it stays a plain number.
    expect(b[3][3]).toBe('-12.5');
    expect(data.every((r) => Number(r[6]) > 0 && ['ok', 'outside-range'].includes(r[8]))).toBe(true);
  });

  it('when 1-minute rollups are exported, then each minute has its count, ranges and geometric-mean ratio', async () => {
    const res = await exportCsv(`tankIds=${b1}&source=1m&from=${iso(START)}&to=${iso(START + 3_600_000)}`);
    const [header, ...data] = rows(res.text);
    expect(header).toEqual([...ROLLUP_EXPORT_COLUMNS]);
    const minute = (ms: number) => iso(ms).replace('.000Z', 'Z');
    expect(data.map((r) => [r[2], r[3]])).toEqual([[minute(START), '12'], [minute(START + 60_000), '12']]);
    expect(Number(data[0][5])).toBe(-12.5);
    expect(Number(data[0][13])).toBeGreaterThanOrEqual(Number(data[0][14]));
  });

  it('when a tag starts like a spreadsheet formula, then the cell is escaped with an apostrophe', async () => {
    await t.sequelize.query(`UPDATE tanks SET tag = '=B1+1' WHERE id = ${b1}`);
    try {
      const res = await exportCsv(`tankIds=${b1}&source=1h&from=${iso(START)}&to=${iso(START + 3_600_000)}`);
      const [, first] = rows(res.text);
      expect(first[0]).toBe("'=B1+1");
    } finally {
      await t.sequelize.query(`UPDATE tanks SET tag = 'B1' WHERE id = ${b1}`);
    }
  });

  it('when the query is incomplete or a tank unknown, then 400 or 404 in problem+json', async () => {
    expect((await exportCsv('source=raw')).status).toBe(400);
    expect((await exportCsv(`tankIds=${b1}&from=${iso(START + 1000)}&to=${iso(START)}`)).status).toBe(400);
    const unknown = await exportCsv(`tankIds=99999&from=${iso(START)}&to=${iso(START + 1000)}`);
    expect(unknown.status).toBe(404);
    expect(unknown.headers['content-type']).toMatch(/problem\+json/);
  });

  it('when a signed-out client asks, then 401', async () => {
    expect((await request(t.app).get(`/api/readings/export?tankIds=${b1}&from=${iso(START)}&to=${iso(START + 1000)}`)).status).toBe(401);
  });
});

describe('the one CSV writer behind every export (api/src/lib/csv.ts)', () => {
  // RFC 4180 quoting and CRLF records; formula-like text escaped as OWASP "CSV Injection" advises.
  it('when text starts like a formula, then it is prefixed with an apostrophe; numbers and quotes are kept', () => {
    const text = csvText([['a', 'b', 'c', 'd'], ['=SUM(A1)', '+1', -12.5, 'say "hi", then go'], ['@x', '-x', null, 'plain']]);
    expect(text).toBe(`a,b,c,d\r\n'=SUM(A1),'+1,-12.5,"say ""hi"", then go"\r\n'@x,'-x,,plain\r\n`);
  });
});
