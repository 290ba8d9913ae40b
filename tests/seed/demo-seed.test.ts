import { QueryTypes, type Sequelize } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { formalPotentialAtV, orpToRatio } from '../../shared/redox/index.ts';
import { initModels } from '../../api/src/db/models.ts';
import { createSequelize } from '../../api/src/db/sequelize.ts';
import { calibrationService } from '../../api/src/modules/calibration/calibration.service.ts';
import { probeChecksService } from '../../api/src/modules/probe-checks/probe-checks.service.ts';
import { seedDemo } from '../../scripts/seed.ts';
import type { DemoHistorySummary } from '../../scripts/seed/demo-history.ts';
import { DEMO_CIRCUITS } from '../../scripts/seed/demo-plant.ts';
import { createTestDatabase, type TestDatabase } from '../helpers/test-db.ts';

const DAY_MS = 86_400_000;
const MINUTES_A_WEEK = 7 * 1440;

let db: TestDatabase;
let sequelize: Sequelize;
let summary: DemoHistorySummary | undefined;
let seedMs = 0;
const now = new Date();

const rows = <T extends object>(sql: string, replacements: unknown[] = []) =>
  sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });
const tankId = async (tag: string) => (await rows<{ id: number }>('SELECT id FROM tanks WHERE tag = ?', [tag]))[0].id;

beforeAll(async () => {
  db = await createTestDatabase();
  const t = Date.now();
  await seedDemo(db.databaseUrl, 'sim-device-password-for-tests', { history: true, now, onHistory: (h) => { summary = h; } });
  seedMs = Date.now() - t;
  sequelize = createSequelize(db.databaseUrl, 2);
  initModels(sequelize);
}, 180_000);

afterAll(async () => {
  await sequelize?.close();
  await db?.drop();
});

describe('demo seed with a week of history', () => {
  it('when the demo plant is seeded, then every probe has a week of 1-minute readings with their rollups', async () => {
    const counts = await rows<{ tag: string; n: number; n1m: number; n1h: number; first: Date; last: Date }>(
      `SELECT p.tag, (SELECT COUNT(*) FROM readings r WHERE r.probe_id = p.id) AS n,
              (SELECT SUM(n) FROM rollups_1m m WHERE m.probe_id = p.id) AS n1m,
              (SELECT SUM(n) FROM rollups_1h h WHERE h.probe_id = p.id) AS n1h,
              (SELECT MIN(ts) FROM readings r WHERE r.probe_id = p.id) AS first, (SELECT MAX(ts) FROM readings r WHERE r.probe_id = p.id) AS last
         FROM probes p ORDER BY p.tag`);
    expect(counts).toHaveLength(10);
    for (const c of counts) {
      // B2 misses the minutes its probe was out for cleaning.
      expect(Number(c.n), c.tag).toBeGreaterThanOrEqual(MINUTES_A_WEEK - 15);
      expect(Number(c.n), c.tag).toBeLessThanOrEqual(MINUTES_A_WEEK);
      expect(Number(c.n1m), c.tag).toBe(Number(c.n));
      expect(Number(c.n1h), c.tag).toBe(Number(c.n));
      expect(now.getTime() - new Date(c.last).getTime()).toBeLessThan(2 * 60_000);
      expect(now.getTime() - new Date(c.first).getTime()).toBeGreaterThan(6.99 * DAY_MS);
    }
    expect(summary?.readings).toBe(counts.reduce((s, c) => s + Number(c.n), 0));
    process.stdout.write(`demo seed took ${(seedMs / 1000).toFixed(1)} s (history ${((summary?.ms ?? 0) / 1000).toFixed(1)} s)\n`);
  });

  it('when a stored history reading is converted again with its probe and calibration, then it gives the stored ratio', async () => {
    const [r] = await rows<{ orp_mv: number; temp_c: number; ratio: number; ref_id: string; e25: number; k: number; e0: number; k0: number; s: number }>(
      `SELECT r.orp_mv, r.temp_c, r.ratio, p.reference_id AS ref_id, c.slope_efficiency AS s, p.reference_e25_v AS e25, p.reference_coeff_v_per_k AS k, c.formal_potential_v AS e0, c.formal_coeff_v_per_k AS k0
         FROM readings r JOIN probes p ON p.id = r.probe_id JOIN calibrations c ON c.tank_id = p.tank_id AND c.version = r.calibration_version
        WHERE p.tag = 'A1-ORP' ORDER BY r.ts LIMIT 1`);
    const again = orpToRatio({ orpMv: r.orp_mv, tempC: r.temp_c, reference: { id: r.ref_id, label: 'x', e25V: r.e25, coeffVPerK: r.k, source: 'test' }, formalPotentialV: r.e0, formalCoeffVPerK: r.k0, slopeEfficiency: r.s });
    expect(again.ratio).toBeCloseTo(r.ratio, 9);
  });

  it('when the assays of a tank are fitted on Calibration, then the fit recovers the seeded formal potential within a few mV', async () => {
    for (const [tag, circuit] of [['A1', 'A'], ['A3', 'A'], ['B1', 'B'], ['B4', 'B']] as const) {
      const fit = await calibrationService.fit(await tankId(tag), {
        from: new Date(now.getTime() - 8 * DAY_MS).toISOString(), to: now.toISOString(), excluded: [], slopeEfficiency: 1,
      });
      const seeded = DEMO_CIRCUITS.find((c) => c.tag === circuit)!;
      // Compared at the assays' temperature: a week in one tank spans too little to fit k.
      const fittedMv = formalPotentialAtV(fit.formalPotentialV, fit.meanTempC, fit.formalCoeffVPerK) * 1000;
      const seededMv = formalPotentialAtV(seeded.formalPotentialV, fit.meanTempC, seeded.formalCoeffVPerK) * 1000;
      expect(fit.n, tag).toBeGreaterThanOrEqual(10);
      expect(Math.abs(fittedMv - seededMv), tag).toBeLessThan(3);
      expect(fit.rmsMv, tag).toBeLessThan(4);
    }
  });

  it('when the probe check schedule is read, then exactly one probe is overdue', async () => {
    const overdue = (await probeChecksService.due(now)).filter((d) => d.overdue);
    expect(overdue.map((d) => d.probeTag)).toEqual(['A6-ORP']);
  });

  it('when the alarm record is read, then the A3 feed upset shows as one acknowledged below-band alarm of about 40 minutes', async () => {
    const a3 = await rows<{ opened_at: Date; closed_at: Date | null; acked_by: string | null; state: string }>(
      `SELECT i.opened_at, i.closed_at, i.acked_by, i.state FROM alarm_instances i JOIN alarm_definitions d ON d.id = i.definition_id
        WHERE d.tank_id = ? AND d.kind = 'ratio-below-band'`, [await tankId('A3')]);
    expect(a3).toHaveLength(1);
    expect(['Ana Lindqvist', 'Mirela Haas']).toContain(a3[0].acked_by); // whoever supervised the shift it fell in
    const minutes = (new Date(a3[0].closed_at!).getTime() - new Date(a3[0].opened_at).getTime()) / 60_000;
    expect(minutes).toBeGreaterThan(30);
    expect(minutes).toBeLessThan(50);
    const open = await rows<{ n: number }>("SELECT COUNT(*) AS n FROM alarm_instances WHERE open_definition_id IS NOT NULL AND state IN ('unacknowledged', 'rtn-unacknowledged')");
    expect(Number(open[0].n)).toBe(0);
  });

  it('when the band record is read, then it holds applied changes with reasons and one rejected request', async () => {
    const changes = await rows<{ reason: string; decision: string | null }>(
      'SELECT b.reason, d.decision FROM band_changes b LEFT JOIN band_change_decisions d ON d.change_id = b.id');
    expect(changes.length).toBeGreaterThanOrEqual(3);
    expect(changes.every((c) => c.reason.length > 10)).toBe(true);
    expect(changes.filter((c) => c.decision === 'rejected')).toHaveLength(1);
  });

  it('when the shift log is read, then the previous shift is closed with a handover note and the week has entries', async () => {
    const shifts = await rows<{ ends_at: Date; closed_at: Date | null; handover_note: string | null }>('SELECT ends_at, closed_at, handover_note FROM shifts ORDER BY starts_at DESC');
    const previous = shifts.find((s) => new Date(s.ends_at).getTime() <= now.getTime());
    expect(previous?.closed_at).not.toBeNull();
    expect(previous?.handover_note?.length).toBeGreaterThan(20);
    const [entries] = await rows<{ n: number }>('SELECT COUNT(*) AS n FROM shift_log_entries');
    expect(Number(entries.n)).toBeGreaterThan(14);
  });

  it('when the seed runs again on the seeded database, then it changes nothing', async () => {
    const before = await rows<{ n: number }>('SELECT COUNT(*) AS n FROM readings');
    expect(await seedDemo(db.databaseUrl, 'sim-device-password-for-tests', { history: true })).toBe(false);
    const after = await rows<{ n: number }>('SELECT COUNT(*) AS n FROM readings');
    expect(after[0].n).toBe(before[0].n);
  });
});
