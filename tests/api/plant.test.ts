import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { planTrend } from '../../api/src/modules/plant/trend.repository.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

const get = (path: string) => request(t.app).get(path).set('Cookie', t.cookies.operator);

/** Writes synthetic converted readings and their 1-minute rollups straight into the tables. */
async function insertSeries(probeId: number, start: Date, count: number, stepS: number, ratio: (i: number) => number) {
  const rows: string[] = [];
  for (let i = 0; i < count; i++) {
    const ts = new Date(start.getTime() + i * stepS * 1000).toISOString().replace('T', ' ').replace('Z', '');
    rows.push(`(${probeId}, '${ts}', ${i}, 400, 42, 0.7, ${ratio(i)}, 0.9, 'ok', 1, NOW(3))`);
  }
  await t.sequelize.query(`INSERT INTO readings (probe_id, ts, seq, orp_mv, temp_c, eh_v, ratio, ferric_fraction, flag, calibration_version, received_at) VALUES ${rows.join(',')}`);
  await t.sequelize.query(`INSERT INTO rollups_1m SELECT probe_id, DATE_FORMAT(ts, '%Y-%m-%d %H:%i:00'), COUNT(*), MIN(orp_mv), MAX(orp_mv), AVG(orp_mv),
    MIN(eh_v), MAX(eh_v), AVG(eh_v), MIN(temp_c), MAX(temp_c), AVG(temp_c), AVG(LOG10(ratio)), MIN(LOG10(ratio)), MAX(LOG10(ratio))
    FROM readings WHERE probe_id = ${probeId} GROUP BY 1, 2 ON DUPLICATE KEY UPDATE n = VALUES(n)`);
}

describe('plant', () => {
  it('when an operator asks for the plant, then both demo circuits come in train order with bands, probes and calibrations', async () => {
    const res = await get('/api/plant');
    expect(res.status).toBe(200);
    const site = res.body.sites[0];
    expect(site.tag).toBe('kestrel');
    expect(site.circuits.map((c: { tag: string }) => c.tag)).toEqual(['A', 'B']);
    expect(site.circuits[0].tanks.map((x: { tag: string }) => x.tag)).toEqual(['A1', 'A2', 'A3', 'A4', 'A5', 'A6']);
    const a1 = site.circuits[0].tanks[0];
    expect(a1.band).toEqual({ low: 8, high: 25, target: 14 });
    expect(a1.probe).toMatchObject({ tag: 'A1-ORP', referenceId: 'agcl-3m' });
    expect(a1.calibration.version).toBe(1);
    expect(a1.latest).toBeNull();
  });

  it('when a tank id is unknown or not a number, then 404 or 400', async () => {
    expect((await get('/api/tanks/9999')).status).toBe(404);
    expect((await get('/api/tanks/xyz')).status).toBe(400);
  });

  it('when readings exist, then the tank shows the newest as latest', async () => {
    const plant = (await get('/api/plant')).body;
    const tank = plant.sites[0].circuits[1].tanks[0];
    await insertSeries(tank.probe.id, new Date(Date.now() - 3600_000), 10, 5, (i) => 1 + i / 10);
    const res = await get(`/api/tanks/${tank.id}`);
    expect(res.body.tank.latest.ratio).toBeCloseTo(1.9, 9);
    expect(res.body.circuit.tag).toBe('B');
  });
});

describe('trend', () => {
  it('when the range is short, then raw points are returned as they are', () => {
    expect(planTrend(3600, 2000, 5)).toEqual({ source: 'raw', bucketS: 0 });
    expect(planTrend(3600, 2000, 1).source).toBe('raw');
    expect(planTrend(7 * 86400, 2000, 5).source).toBe('1m');
    expect(planTrend(30 * 86400, 2000, 1)).toEqual({ source: '1m', bucketS: 1296 });
    expect(planTrend(365 * 86400, 2000, 1).source).toBe('1h');
  });

  it('when a week is asked for, then at most maxPoints points come back from the rollups, with the geometric mean ratio', async () => {
    const plant = (await get('/api/plant')).body;
    const tank = plant.sites[0].circuits[0].tanks[2];
    const start = new Date(Date.UTC(2026, 10, 1));
    // ratio alternates 10 and 1000 each minute; 504 points make 20-minute buckets, whose geometric mean is 100.
    await insertSeries(tank.probe.id, start, 7 * 24 * 60, 60, (i) => (i % 2 === 0 ? 10 : 1000));
    const to = new Date(start.getTime() + 7 * 86400_000);
    const res = await get(`/api/tanks/${tank.id}/trend?from=${start.toISOString()}&to=${to.toISOString()}&maxPoints=504`);
    expect(res.status).toBe(200);
    expect(res.body.resolution).toBe('1m');
    expect(res.body.t.length).toBeLessThanOrEqual(504);
    expect(res.body.t.length).toBeGreaterThan(400);
    expect(res.body.ratio[10]).toBeCloseTo(100, 6);
    expect(res.body.ratioMin[10]).toBeCloseTo(10, 6);
    expect(res.body.ratioMax[10]).toBeCloseTo(1000, 6);
  });

  it('when from is after to or dates are bad, then 400 with the field', async () => {
    const res = await get('/api/tanks/1/trend?from=2026-11-02T00:00:00Z&to=2026-11-01T00:00:00Z');
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('from');
    expect((await get('/api/tanks/1/trend?from=yesterday&to=now')).status).toBe(400);
    expect((await get('/api/tanks/1/trend?from=2026-11-01T00:00:00Z&to=2026-11-02T00:00:00Z&maxPoints=1')).status).toBe(400);
  });
});
