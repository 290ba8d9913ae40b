import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { overdueProbeChecks } from '../../api/src/modules/probe-checks/probe-checks.service.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';
import { as, auditActions, probeOf } from './helpers.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

const DAY = 86_400_000;
const check = (body: object) => as(t, 'metallurgist').post('/api/probe-checks', body);

describe('probe checks against standard solutions', () => {
  // ZoBell's solution, Eh vs SHE from Standard Methods for the Examination of Water and Wastewater,
  // method 2580, Table 2580:I: 0.428 V at 25 °C and 0.461 V at 10 °C.
  it("when a probe reads ZoBell's solution at 25 °C, then expected = 0.428 V − E_ref (Standard Methods 2580, Table 2580:I)", async () => {
    const probe = await probeOf(t, 'A1'); // Ag/AgCl 3 M KCl, 0.210 V at 25 °C in the demo plant
    const res = await check({ probeId: probe.id, standard: 'zobell', tempC: 25, readingMv: 225 });
    expect(res.status).toBe(201);
    expect(res.body.check.expectedMv).toBeCloseTo(218, 9);
    expect(res.body.check.errorMv).toBeCloseTo(7, 9);
    expect(res.body.check).toMatchObject({ pass: true, toleranceMv: 10, standard: 'zobell' });
    expect(await auditActions(t, 'probe', probe.id)).toEqual(['probe.check']);
  });

  it("when ZoBell's solution at 10 °C is read against a 0.2135 V reference, then +236 mV is 11.5 mV off: fails ±10, passes ±15", async () => {
    const probe = await probeOf(t, 'A2');
    // Worked check: Table 2580:I gives 0.461 V at 10 °C, so the expected reading is +247.5 mV.
    await t.sequelize.query(`UPDATE probes SET reference_e25_v = 0.2135, reference_coeff_v_per_k = 0 WHERE id = ${probe.id}`);
    const strict = await check({ probeId: probe.id, standard: 'zobell', tempC: 10, readingMv: 236, toleranceMv: 10 });
    expect(strict.body.check.expectedMv).toBeCloseTo(247.5, 9);
    expect(strict.body.check.errorMv).toBeCloseTo(-11.5, 9);
    expect(strict.body.check.pass).toBe(false);
    const loose = await check({ probeId: probe.id, standard: 'zobell', tempC: 10, readingMv: 236, toleranceMv: 15 });
    expect(loose.body.check.pass).toBe(true);
  });

  it("when Light's solution is read at 25 °C against 0.199 V, then +476 mV is exactly as expected (Standard Methods 2580; ASTM D1498: 0.675 V)", async () => {
    const probe = await probeOf(t, 'A3');
    await t.sequelize.query(`UPDATE probes SET reference_e25_v = 0.199, reference_coeff_v_per_k = -0.001 WHERE id = ${probe.id}`);
    const res = await check({ probeId: probe.id, standard: 'light', tempC: 25, readingMv: 476 });
    expect(res.body.check.expectedMv).toBeCloseTo(476, 9);
    expect(res.body.check.pass).toBe(true);
  });

  it('when the standard is outside its tabulated temperatures, then 400 says so; an operator cannot record checks', async () => {
    const probe = await probeOf(t, 'A4');
    const res = await check({ probeId: probe.id, standard: 'zobell', tempC: 40, readingMv: 200 });
    expect(res.status).toBe(400);
    expect(res.body.detail).toMatch(/ZoBell/);
    expect((await as(t, 'operator').post('/api/probe-checks', { probeId: probe.id, standard: 'zobell', tempC: 25, readingMv: 218 })).status).toBe(403);
  });
});

describe('check due dates', () => {
  const dueOf = async (probeId: number) =>
    (await as(t, 'operator').get('/api/probe-checks/schedule')).body.probes.find((p: { probeId: number }) => p.probeId === probeId);

  it('when a probe installed 20 days ago has never been checked, then it is overdue from installation + 7 days', async () => {
    const probe = await probeOf(t, 'B1');
    const due = await dueOf(probe.id);
    expect(due).toMatchObject({ intervalDays: 7, basis: 'installation', overdue: true, lastCheck: null });
    expect((await overdueProbeChecks()).map((d) => d.probeId)).toContain(probe.id);
  });

  it('when the probe passes a check, then the next is due one interval later; a failed check makes it due at once', async () => {
    const probe = await probeOf(t, 'B2');
    const passed = await check({ probeId: probe.id, standard: 'zobell', tempC: 25, readingMv: 218 });
    expect(passed.body.check.pass).toBe(true);
    let due = await dueOf(probe.id);
    expect(due).toMatchObject({ basis: 'last-pass', overdue: false });
    expect(Date.parse(due.dueAt) - Date.parse(passed.body.check.checkedAt)).toBe(7 * DAY);
    await check({ probeId: probe.id, standard: 'zobell', tempC: 25, readingMv: 260 });
    due = await dueOf(probe.id);
    expect(due).toMatchObject({ basis: 'failed-check', overdue: true });
  });

  it('when a probe gets its own interval or is replaced, then the due date follows, and both are recorded', async () => {
    const probe = await probeOf(t, 'B3');
    await check({ probeId: probe.id, standard: 'zobell', tempC: 25, readingMv: 220, checkedAt: new Date(Date.now() - 5 * DAY).toISOString() });
    expect((await dueOf(probe.id)).overdue).toBe(false);
    const set = await as(t, 'metallurgist').put(`/api/probe-checks/schedule/${probe.id}`, { intervalDays: 3, reason: 'Fouls quickly in this tank' });
    expect(set.body.probe).toMatchObject({ intervalDays: 3, overdue: true });
    await as(t, 'metallurgist').put(`/api/probe-checks/schedule/${probe.id}`, { intervalDays: 14, reason: 'Back to normal duty' });
    expect((await dueOf(probe.id)).overdue).toBe(false);
    const rep = await as(t, 'metallurgist').post('/api/probe-checks/replacements', {
      probeId: probe.id, part: 'reference', replacedAt: new Date(Date.now() - 60_000).toISOString(), reason: 'Junction blocked',
    });
    expect(rep.status).toBe(201);
    expect(await dueOf(probe.id)).toMatchObject({ basis: 'replacement', overdue: true });
    expect((await as(t, 'operator').get(`/api/probe-checks/replacements?probeId=${probe.id}`)).body.replacements[0]).toMatchObject({ part: 'reference', reason: 'Junction blocked' });
    expect(await auditActions(t, 'probe', probe.id)).toEqual(['probe.check', 'probe.check-interval', 'probe.check-interval', 'probe.replacement']);
  });
});
