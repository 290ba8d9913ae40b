import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { assaysService } from '../../api/src/modules/assays/assays.service.ts';
import { nernstSlopeV } from '../../shared/redox/index.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { as, auditActions, insertReadings, probeOf, tankId } from './helpers.ts';

let t: TestApi;
let b3: number;
beforeAll(async () => {
  t = await createTestApi();
  b3 = await tankId(t, 'B3');
});
afterAll(async () => t?.close());

const minute = (ms: number) => Math.floor(ms / 60_000) * 60_000;

describe('assay entry', () => {
  it('when an assay is entered in mg/L or mol/L, then it is stored in g/L (Fe 55.845 g/mol) and audited', async () => {
    const sampledAt = new Date(minute(Date.now() - 5 * 3_600_000)).toISOString();
    const res = await as(t, 'metallurgist').post('/api/assays', {
      tankId: b3, sampledAt, fe2: 0.05, feTotal: 0.2, unit: 'mol/L', method: 'dichromate titration', analyst: 'PO', labRef: 'L-77',
    });
    expect(res.status).toBe(201);
    expect(res.body.assay.fe2GPerL).toBeCloseTo(0.05 * 55.845, 9);
    expect(res.body.assay.feTotalGPerL).toBeCloseTo(0.2 * 55.845, 9);
    expect(res.body.assay.labRatio).toBeCloseTo(3, 9);
    expect(await auditActions(t, 'assay', res.body.assay.id)).toEqual(['assay.create']);
    const dup = await as(t, 'admin').post('/api/assays', { tankId: b3, sampledAt, fe2: 1, feTotal: 2, unit: 'g/L' });
    expect(dup.status).toBe(409);
  });

  it('when Fe²⁺ is above total Fe or the time is in the future, then 400 names the field', async () => {
    const bad = await as(t, 'metallurgist').post('/api/assays', { tankId: b3, sampledAt: new Date().toISOString(), fe2: 5, feTotal: 2, unit: 'g/L' });
    expect(bad.body.errors.map((e: { path: string }) => e.path)).toEqual(['fe2']);
    const future = await as(t, 'metallurgist').post('/api/assays', { tankId: b3, sampledAt: new Date(Date.now() + 3_600_000).toISOString(), fe2: 1, feTotal: 2, unit: 'g/L' });
    expect(future.body.errors.map((e: { path: string }) => e.path)).toEqual(['sampledAt']);
    expect((await as(t, 'operator').post('/api/assays', { tankId: b3, sampledAt: new Date().toISOString(), fe2: 1, feTotal: 2, unit: 'g/L' })).status).toBe(403);
  });

  it('when readings surround the sampling time, then the probe ratio is the mean of their log ratio and the difference is in mV', async () => {
    const probe = await probeOf(t, 'B4');
    const b4 = await tankId(t, 'B4');
    const at = minute(Date.now() - 3 * 3_600_000);
    // Inside ±10 min: ratios 1 and 4 (geometric mean 2) at 80 °C; outside: a wild value that must be ignored.
    await insertReadings(t, probe.id, [
      { tsMs: at - 9 * 60_000, orpMv: 440, tempC: 79, ratio: 1 },
      { tsMs: at + 9 * 60_000, orpMv: 460, tempC: 81, ratio: 4 },
      { tsMs: at + 11 * 60_000, orpMv: 900, tempC: 80, ratio: 1000 },
    ]);
    // Lab: total 12, Fe²⁺ 6 → ratio 1.
    const res = await as(t, 'metallurgist').post('/api/assays', { tankId: b4, sampledAt: new Date(at).toISOString(), fe2: 6, feTotal: 12, unit: 'g/L' });
    const m = res.body.assay.match;
    expect(m).toMatchObject({ n: 2, probeId: probe.id, orpMv: 450, tempC: 80 });
    expect(m.probeRatio).toBeCloseTo(2, 9);
    // Probe minus lab = ln(2/1)·R·T/F at 80 °C ≈ 0.6931 × 30.43 mV ≈ +21.1 mV.
    expect(m.diffMv).toBeCloseTo(Math.log(2) * nernstSlopeV(80) * 1000, 6);
    expect(m.diffMv).toBeCloseTo(21.09, 1);
    expect(await assaysService.latestAssayDriftMv(b4)).toBeCloseTo(m.diffMv, 9);
    expect(await assaysService.latestAssayDriftMv(await tankId(t, 'A6'))).toBeNull();
  });

  it('when an assay is retracted with a reason, then it leaves the drift figure and a corrected result can be entered', async () => {
    const b4 = await tankId(t, 'B4');
    const [latest] = (await as(t, 'operator').get(`/api/assays?tankId=${b4}`)).body.assays;
    expect((await as(t, 'metallurgist').post(`/api/assays/${latest.id}/retract`, {})).status).toBe(400);
    const res = await as(t, 'metallurgist').post(`/api/assays/${latest.id}/retract`, { reason: 'Sample bottle mislabelled' });
    expect(res.body.assay.retracted).toMatchObject({ reason: 'Sample bottle mislabelled' });
    expect(await assaysService.latestAssayDriftMv(b4)).toBeNull();
    const again = await as(t, 'metallurgist').post('/api/assays', { tankId: b4, sampledAt: latest.sampledAt, fe2: 4, feTotal: 12, unit: 'g/L' });
    expect(again.status).toBe(201);
    // Corrected lab ratio (12 − 4)/4 = 2 now equals the probe ratio: no drift.
    expect(await assaysService.latestAssayDriftMv(b4)).toBeCloseTo(0, 6);
  });
});
