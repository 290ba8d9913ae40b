import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ratioToOrpMv, referenceById } from '../../shared/redox/index.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { as, auditActions, insertReadings, probeOf, tankId } from './helpers.ts';

let t: TestApi;
let a1: number;
beforeAll(async () => {
  t = await createTestApi();
  a1 = await tankId(t, 'A1');
});
afterAll(async () => t?.close());

const bandOf = async (id: number) => (await as(t, 'operator').get(`/api/tanks/${id}`)).body.tank.band;

describe('band changes', () => {
  it('when a metallurgist narrows a band with a reason, then it takes effect at once and is recorded with old, new, who and why', async () => {
    const res = await as(t, 'metallurgist').put(`/api/bands/${a1}`, { low: 9, high: 24, target: 15, reason: 'Tighter band after the October survey' });
    expect(res.status).toBe(200);
    expect(res.body.change).toMatchObject({
      status: 'applied', needsApproval: false, old: { low: 8, high: 25, target: 14 }, new: { low: 9, high: 24, target: 15 },
      reason: 'Tighter band after the October survey', requestedBy: { id: t.users.metallurgist },
    });
    expect(await bandOf(a1)).toEqual({ low: 9, high: 24, target: 15 });
    expect(await auditActions(t, 'tank', a1)).toContain('band.change');
  });

  it('when the reason is missing, high ≤ low or the target is outside the band, then 400 names the field and nothing changes', async () => {
    const m = as(t, 'metallurgist');
    const noReason = await m.put(`/api/bands/${a1}`, { low: 9, high: 24, target: 15 });
    expect(noReason.status).toBe(400);
    expect(noReason.body.errors.map((e: { path: string }) => e.path)).toContain('reason');
    const inverted = await m.put(`/api/bands/${a1}`, { low: 20, high: 10, target: null, reason: 'typo test' });
    expect(inverted.body.errors.map((e: { path: string }) => e.path)).toContain('high');
    const target = await m.put(`/api/bands/${a1}`, { low: 9, high: 24, target: 30, reason: 'typo test' });
    expect(target.body.errors.map((e: { path: string }) => e.path)).toContain('target');
    const zero = await m.put(`/api/bands/${a1}`, { low: 0, high: 24, target: null, reason: 'typo test' });
    expect(zero.body.errors.map((e: { path: string }) => e.path)).toContain('low');
    expect(await bandOf(a1)).toEqual({ low: 9, high: 24, target: 15 });
  });

  it('when a bound moves by more than a factor of 2, then the change waits for a second person and the band stays as it was', async () => {
    const a2 = await tankId(t, 'A2');
    const res = await as(t, 'metallurgist').put(`/api/bands/${a2}`, { low: 20, high: 60, target: null, reason: 'Trial of a high-potential window' });
    expect(res.body.change).toMatchObject({ status: 'pending', needsApproval: true });
    const id = res.body.change.id;
    expect(await bandOf(a2)).toEqual({ low: 8, high: 25, target: 14 });
    const pending = await as(t, 'operator').get('/api/bands/changes?status=pending');
    expect(pending.body.changes.map((c: { id: number }) => c.id)).toContain(id);
    const listed = (await as(t, 'operator').get('/api/bands')).body.tanks.find((x: { tankId: number }) => x.tankId === a2);
    expect(listed.pending.id).toBe(id);

    expect((await as(t, 'metallurgist').post(`/api/bands/changes/${id}/approve`, {})).status).toBe(403);
    expect((await as(t, 'operator').post(`/api/bands/changes/${id}/approve`, {})).status).toBe(403);
    const again = await as(t, 'admin').put(`/api/bands/${a2}`, { low: 9, high: 25, target: null, reason: 'meanwhile' });
    expect(again.status).toBe(409);

    const ok = await as(t, 'supervisor').post(`/api/bands/changes/${id}/approve`, { note: 'Agreed at the morning meeting' });
    expect(ok.status).toBe(200);
    expect(ok.body.change).toMatchObject({ status: 'approved', decision: { by: { id: t.users.supervisor }, note: 'Agreed at the morning meeting' } });
    expect(await bandOf(a2)).toEqual({ low: 20, high: 60, target: null });
    expect(await auditActions(t, 'tank', a2)).toEqual(['band.request', 'band.approve']);
    expect((await as(t, 'supervisor').post(`/api/bands/changes/${id}/approve`, {})).status).toBe(409);
  });

  it('when a pending change is rejected without a note, then 400; with a note, then it is recorded and the band never changes', async () => {
    const a3 = await tankId(t, 'A3');
    const { body } = await as(t, 'admin').put(`/api/bands/${a3}`, { low: 2, high: 25, target: null, reason: 'Allow a low start-up' });
    const id = body.change.id;
    expect((await as(t, 'metallurgist').post(`/api/bands/changes/${id}/reject`, {})).status).toBe(400);
    const res = await as(t, 'metallurgist').post(`/api/bands/changes/${id}/reject`, { note: 'Start-up is covered by the procedure' });
    expect(res.body.change).toMatchObject({ status: 'rejected', decision: { by: { id: t.users.metallurgist } } });
    expect(await bandOf(a3)).toEqual({ low: 8, high: 25, target: 14 });
    expect(await auditActions(t, 'tank', a3)).toEqual(['band.request', 'band.reject']);
  });

  it('when the requester withdraws a pending change, then it is closed and another person cannot withdraw it', async () => {
    const a4 = await tankId(t, 'A4');
    const { body } = await as(t, 'metallurgist').put(`/api/bands/${a4}`, { low: 8, high: 80, target: null, reason: 'Too wide, on reflection' });
    expect((await as(t, 'admin').post(`/api/bands/changes/${body.change.id}/withdraw`, {})).status).toBe(403);
    const res = await as(t, 'metallurgist').post(`/api/bands/changes/${body.change.id}/withdraw`, {});
    expect(res.body.change.status).toBe('withdrawn');
  });

  it('when a band is copied to the other tanks of the circuit, then each tank gets its own record; a tank of another circuit refuses the whole copy', async () => {
    const a5 = await tankId(t, 'A5');
    const a6 = await tankId(t, 'A6');
    const b1 = await tankId(t, 'B1');
    const refused = await as(t, 'metallurgist').post(`/api/bands/${a1}/copy`, { tankIds: [a5, b1], reason: 'Same band for the train' });
    expect(refused.status).toBe(400);
    expect(await bandOf(a5)).toEqual({ low: 8, high: 25, target: 14 });
    const res = await as(t, 'metallurgist').post(`/api/bands/${a1}/copy`, { tankIds: [a5, a6], reason: 'Same band for the train' });
    expect(res.status).toBe(201);
    expect(res.body.changes).toHaveLength(2);
    for (const c of res.body.changes) expect(c).toMatchObject({ status: 'applied', copiedFromTankId: a1, new: { low: 9, high: 24, target: 15 } });
    expect(await bandOf(a6)).toEqual({ low: 9, high: 24, target: 15 });
  });

  it('when the tank has a reading, then the band is also shown in mV at its temperature with its probe reference', async () => {
    const probe = await probeOf(t, 'A1');
    await insertReadings(t, probe.id, [{ tsMs: Date.now() - 60_000, orpMv: 420, tempC: 42, ratio: 12 }]);
    const row = (await as(t, 'operator').get('/api/bands')).body.tanks.find((x: { tankId: number }) => x.tankId === a1);
    // Demo plant: probe Ag/AgCl 3 M KCl, train A calibration E°′ 0.684 V with k = 0.9 mV/K.
    const cond = { tempC: 42, reference: referenceById('agcl-3m'), formalPotentialV: 0.684, formalCoeffVPerK: 0.0009 };
    expect(row.mv.lowMv).toBeCloseTo(ratioToOrpMv({ ...cond, ratio: 9 }), 6);
    expect(row.mv.highMv).toBeCloseTo(ratioToOrpMv({ ...cond, ratio: 24 }), 6);
    expect(row.mv).toMatchObject({ tempC: 42, calibrationVersion: 1 });
    expect(row.mv.highMv - row.mv.lowMv).toBeGreaterThan(20);
  });

  it('when three steps, each under the factor of 2, add up to more than 2 within 24 h, then the third waits for a second person and shows the whole move', async () => {
    const a3 = await tankId(t, 'A3');
    const start = await bandOf(a3);
    const m = as(t, 'metallurgist');
    // Each step moves both bounds by about 1.3×; together 17/8 = 2.1× and 55/25 = 2.2× (default factor 2, window 24 h).
    const s1 = await m.put(`/api/bands/${a3}`, { low: 10, high: 32, target: null, reason: 'Step one of the trial' });
    const s2 = await m.put(`/api/bands/${a3}`, { low: 13, high: 42, target: null, reason: 'Step two of the trial' });
    const s3 = await m.put(`/api/bands/${a3}`, { low: 17, high: 55, target: null, reason: 'Step three of the trial' });
    expect([s1.body.change.status, s2.body.change.status, s3.body.change.status]).toEqual(['applied', 'applied', 'pending']);
    expect(s2.body.change.cumulativeFrom.band).toEqual(start);
    expect(s3.body.change).toMatchObject({ needsApproval: true, old: { low: 13, high: 42 }, cumulativeFrom: { band: start } });
    expect(Date.parse(s3.body.change.cumulativeFrom.since)).toBe(Date.parse(s1.body.change.requestedAt));
    expect(await bandOf(a3)).toMatchObject({ low: 13, high: 42 });

    // A second person's approval starts the count afresh: a small step after it applies at once.
    expect((await as(t, 'supervisor').post(`/api/bands/changes/${s3.body.change.id}/approve`, {})).status).toBe(200);
    const s4 = await m.put(`/api/bands/${a3}`, { low: 18, high: 58, target: null, reason: 'Fine tuning after approval' });
    expect(s4.body.change).toMatchObject({ status: 'applied', cumulativeFrom: null });
  });

  it('when the window is set to 0 h, then each step is judged alone again', async () => {
    const siteId = (await as(t, 'operator').get('/api/site-settings')).body.sites[0].siteId;
    const set = await as(t, 'admin').put('/api/site-settings', { siteId, key: 'bandApprovalWindowH', value: 0, reason: 'Trial of single-step review' });
    expect(set.body.settings.bandApprovalWindowH).toBe(0);
    const a4 = await tankId(t, 'A4');
    const m = as(t, 'metallurgist');
    const steps = [[10, 32], [13, 42], [17, 55]];
    const statuses = [];
    for (const [low, high] of steps) statuses.push((await m.put(`/api/bands/${a4}`, { low, high, target: null, reason: 'Stepwise' })).body.change.status);
    expect(statuses).toEqual(['applied', 'applied', 'applied']);
    await as(t, 'admin').put('/api/site-settings', { siteId, key: 'bandApprovalWindowH', value: 24, reason: 'Back to the site default' });
  });

  it('when an admin raises the approval factor to 5, then a threefold change applies at once', async () => {
    const siteId = (await as(t, 'operator').get('/api/site-settings')).body.sites[0].siteId;
    expect((await as(t, 'metallurgist').put('/api/site-settings', { siteId, key: 'bandApprovalFactor', value: 5, reason: 'x' })).status).toBe(403);
    const set = await as(t, 'admin').put('/api/site-settings', { siteId, key: 'bandApprovalFactor', value: 5, reason: 'Site MOC procedure rev 3' });
    expect(set.body.settings.bandApprovalFactor).toBe(5);
    const b2 = await tankId(t, 'B2');
    const res = await as(t, 'metallurgist').put(`/api/bands/${b2}`, { low: 1.5, high: 6, target: null, reason: 'Higher window for the new ore' });
    expect(res.body.change.status).toBe('applied');
  });

  it("when a band change takes effect, then the tank's below-band alarm limit follows it; a pending one leaves it alone", async () => {
    const b3 = await tankId(t, 'B3');
    const limit = async () => {
      const defs = (await as(t, 'operator').get(`/api/alarms/definitions?tank=${b3}`)).body.definitions as Array<{ kind: string; limit: number }>;
      return defs.find((d) => d.kind === 'ratio-below-band')?.limit;
    };
    if ((await limit()) === undefined) {
      const made = await as(t, 'metallurgist').post('/api/alarms/definitions', {
        tankId: b3, kind: 'ratio-below-band', priority: 2, threshold: null, deadband: 5, onDelayS: 0, offDelayS: 0, windowS: null,
        rationalisation: { cause: 'Oxidant short', consequence: 'Leach slows', action: 'Check the dosing', responseMin: 30 }, reason: 'Test set-up',
      });
      expect(made.status).toBe(201);
    }
    expect(await limit()).toBe(0.5);
    await as(t, 'metallurgist').put(`/api/bands/${b3}`, { low: 0.6, high: 2, target: 1, reason: 'Slightly higher floor' });
    expect(await limit()).toBe(0.6);
    // The site factor is 5 since the test above: 0.6 → 0.1 is a sixfold move and waits.
    const big = await as(t, 'metallurgist').put(`/api/bands/${b3}`, { low: 0.1, high: 2, target: 1, reason: 'Allow a deep reduction trial' });
    expect(big.body.change.status).toBe('pending');
    expect(await limit()).toBe(0.6);
    await as(t, 'supervisor').post(`/api/bands/changes/${big.body.change.id}/approve`, {});
    expect(await limit()).toBe(0.1);
  });
});
