import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { as } from './helpers.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

const HEADER = 'tank,sampled_at,fe2,fe_total,unit,method,analyst,lab_ref,note';
const iso = (hoursAgo: number) => new Date(Math.floor(Date.now() / 60_000) * 60_000 - hoursAgo * 3_600_000).toISOString();
const count = async () => (await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM assays', { type: QueryTypes.SELECT }))[0].n;
const preview = (csv: string | Buffer, name?: string) => as(t, 'metallurgist').upload('/api/assays/csv/preview', csv, name);
const commit = (csv: string | Buffer, name?: string) => as(t, 'metallurgist').upload('/api/assays/csv/commit', csv, name);
type RowError = { row: number; column: string; message: string };

describe('assay CSV upload', () => {
  it('when a good file is previewed and committed, then every row is stored in g/L with its source', async () => {
    const csv = [HEADER, `A1,${iso(30)},1.20,14.8,g/L,dichromate titration,PO,LAB-1,`, `B1,${iso(29)},4100,9800,mg/L,ICP,PO,LAB-2,"note, with comma"`].join('\n');
    const p = await preview(csv);
    expect(p.status).toBe(200);
    expect(p.body).toMatchObject({ rowCount: 2, validCount: 2, errors: [], delimiter: ',', bom: false });
    const c = await commit(csv, 'lab-week-48.csv');
    expect(c.status).toBe(201);
    expect(c.body.inserted).toBe(2);
    const list = (await as(t, 'operator').get('/api/assays?limit=10')).body.assays;
    const b1 = list.find((a: { tankTag: string }) => a.tankTag === 'B1');
    expect(b1).toMatchObject({ fe2GPerL: 4.1, feTotalGPerL: 9.8, unit: 'mg/L', source: 'csv:lab-week-48.csv', note: 'note, with comma' });
  });

  it('when rows are bad, then each is listed by row and column with the reason, and commit stores nothing', async () => {
    const csv = [
      HEADER,
      `A2,${iso(20)},1.1,12.0,g/L,,,,`, // row 2: fine
      `A2,${iso(19)},abc,12.0,g/L,,,,`, // row 3: not a number
      `A2,${iso(18)},13,12.0,g/L,,,,`, // row 4: Fe2+ above total
      `A2,${new Date(Date.now() + 86_400_000).toISOString()},1,12,g/L,,,,`, // row 5: future
      `Z9,${iso(17)},1,12,g/L,,,,`, // row 6: unknown tank
      `A1,${iso(30)},1.20,14.8,g/L,,,,`, // row 7: duplicate of the stored assay from the first test
      `A2,${iso(16)},1,12,ppm,,,,`, // row 8: unit unknown
      `A2,,1,12,g/L,,,,`, // row 9: missing value
    ].join('\n');
    const before = await count();
    const p = await preview(csv);
    expect(p.body.validCount).toBe(1);
    const byRow = (row: number) => p.body.errors.filter((e: RowError) => e.row === row);
    expect(byRow(3)[0]).toMatchObject({ column: 'fe2', message: 'not a number' });
    expect(byRow(4)[0]).toMatchObject({ column: 'fe2', message: expect.stringMatching(/above total Fe/) });
    expect(byRow(5)[0]).toMatchObject({ column: 'sampled_at', message: expect.stringMatching(/future/) });
    expect(byRow(6)[0]).toMatchObject({ column: 'tank', message: "unknown tank 'Z9'" });
    expect(byRow(7)[0]).toMatchObject({ column: 'sampled_at', message: expect.stringMatching(/duplicate of a stored assay/) });
    expect(byRow(8)[0]).toMatchObject({ column: 'unit', message: expect.stringMatching(/unit unknown/) });
    expect(byRow(9)[0]).toMatchObject({ column: 'sampled_at', message: 'missing value' });
    const c = await commit(csv);
    expect(c.status).toBe(400);
    expect(c.body.errors.length).toBe(7);
    expect(await count()).toBe(before);
  });

  it('when a required column is missing, then the header line is reported with the column name', async () => {
    const p = await preview(`tank,sampled_at,fe2,unit\nA1,${iso(5)},1,g/L`);
    expect(p.body.errors).toEqual([{ row: 1, column: 'fe_total', value: '', message: "missing column 'fe_total' in the header line" }]);
    expect(p.body.validCount).toBe(0);
  });

  it('when the file has a UTF-8 BOM, or semicolons with decimal commas, then it is read correctly', async () => {
    const bom = Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(`${HEADER}\nA3,${iso(40)},1.5,15,g/L,,,,`)]);
    const p1 = await preview(bom);
    expect(p1.body).toMatchObject({ bom: true, validCount: 1, errors: [] });
    const semi = `Tank;Sampled at;Fe2+;Total Fe;Unit\nA3;${iso(41)};1,25;14,75;g/L\nA3;${iso(42)};0,021;0,25;mol/L`;
    const p2 = await preview(semi);
    expect(p2.body).toMatchObject({ delimiter: ';', decimalComma: true, validCount: 2, errors: [] });
    expect(p2.body.sample[0]).toMatchObject({ fe2: 1.25, feTotal: 14.75 });
    // mol/L → g/L through the molar mass of iron, 55.845 g/mol.
    expect(p2.body.sample[1].feTotalGPerL).toBeCloseTo(0.25 * 55.845, 9);
  });

  it('when the file is UTF-16 or not UTF-8, then it is refused with what to do', async () => {
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from(HEADER, 'utf16le')]);
    const r1 = await preview(utf16);
    expect(r1.status).toBe(400);
    expect(r1.body.detail).toMatch(/UTF-16.*CSV UTF-8/);
    const latin1 = Buffer.from(`${HEADER}\nA1,${iso(3)},1,12,g/L,,Jos\xe9,,`, 'latin1');
    const r2 = await preview(latin1);
    expect(r2.status).toBe(400);
    expect(r2.body.detail).toMatch(/not valid UTF-8/);
  });

  it('when the file is over the size limit, then 413 problem+json', async () => {
    const big = Buffer.alloc(5 * 1024 * 1024 + 10, 'a');
    const res = await preview(big);
    expect(res.status).toBe(413);
    expect(res.headers['content-type']).toMatch(/problem\+json/);
  });

  it('when an operator uploads, then 403; when no file is attached, then 400', async () => {
    expect((await as(t, 'operator').upload('/api/assays/csv/preview', `${HEADER}\n`)).status).toBe(403);
    expect((await as(t, 'metallurgist').post('/api/assays/csv/preview', {})).status).toBe(400);
  });

  it('when the template is downloaded, then it is CSV with the columns the upload expects', async () => {
    const res = await as(t, 'operator').get('/api/assays/template.csv');
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    expect(res.text.split(/\r?\n/)[0]).toBe(HEADER);
  });

  it('when a file of 10 000 rows is previewed and committed, then both take a few seconds at most', async () => {
    const start = Date.now() - 400 * 86_400_000;
    const lines = [HEADER];
    for (let i = 0; i < 10_000; i++) {
      lines.push(`A6,${new Date(start + i * 600_000).toISOString()},${(1 + (i % 7) / 10).toFixed(2)},14.5,g/L,ICP,QA,LAB-${i},`);
    }
    const csv = lines.join('\r\n');
    let t0 = Date.now();
    const p = await preview(csv);
    const previewMs = Date.now() - t0;
    expect(p.body).toMatchObject({ rowCount: 10_000, validCount: 10_000, errors: [] });
    t0 = Date.now();
    const c = await commit(csv);
    const commitMs = Date.now() - t0;
    expect(c.body.inserted).toBe(10_000);
    expect(previewMs).toBeLessThan(5000);
    expect(commitMs).toBeLessThan(8000);
  });
});
