import { parse } from 'csv-parse/sync';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { DigestResponse, TankDigest } from '../../shared/schemas/digest.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
let shift: { startsAt: string; endsAt: string };
let tanks: { id: number; tag: string; probe: { id: number } }[];
beforeAll(async () => {
  t = await createTestApi();
  tanks = (await get('/api/plant', 'operator')).body.sites[0].circuits.flatMap((c: { tanks: unknown[] }) => c.tanks);
  // The oldest of the last seven shifts: finished, and far from "now".
  const list = (await get('/api/shifts?count=7', 'operator')).body.shifts;
  shift = list[list.length - 1];
  await seed();
});
afterAll(async () => t?.close());

const get = (path: string, role: 'operator' | 'supervisor' | 'metallurgist' = 'supervisor') =>
  request(t.app).get(path).set('Cookie', t.cookies[role]);
const sql = (ts: number) => `'${new Date(ts).toISOString().slice(0, 19).replace('T', ' ')}'`;
const tank = (tag: string) => tanks.find((x) => x.tag === tag)!;

/** One rollup row per minute: ratio constant in the minute, ORP ±5 mV around its mean, 12 readings. */
async function minutes(probeId: number, fromMin: number, toMin: number, ratio: number, orpMv: number, tempC = 42) {
  const start = Date.parse(shift.startsAt);
  const rows: string[] = [];
  for (let m = fromMin; m < toMin; m += 1) {
    const lr = Math.log10(ratio);
    rows.push(`(${probeId}, ${sql(start + m * 60_000)}, 12, ${orpMv - 5}, ${orpMv + 5}, ${orpMv}, 0.6, 0.6, 0.6, ${tempC - 0.5}, ${tempC + 0.5}, ${tempC}, ${lr}, ${lr}, ${lr})`);
  }
  await t.sequelize.query(`INSERT INTO rollups_1m (probe_id, bucket, n, orp_min, orp_max, orp_mean, eh_min, eh_max, eh_mean,
    temp_min, temp_max, temp_mean, log_ratio_mean, log_ratio_min, log_ratio_max) VALUES ${rows.join(',')}`);
}

/**
 * A 12-hour shift of 720 minutes, for A1 and A2 alike:
 *   0–359 ratio 10 (ORP 450), 360–479 silent, 480–599 ratio 30 (ORP 480), 600–719 ratio 4 (ORP 400).
 * A2's band moves from 8–25 to 20–40 at minute 480, so its ratio-30 hour counts in band.
 */
async function seed() {
  const start = Date.parse(shift.startsAt);
  for (const tag of ['A1', 'A2']) {
    const p = tank(tag).probe.id;
    await minutes(p, 0, 360, 10, 450);
    await minutes(p, 480, 600, 30, 480);
    await minutes(p, 600, 720, 4, 400);
  }
  // Hours derived from the minutes, as the ingest store does.
  await t.sequelize.query(`INSERT INTO rollups_1h SELECT probe_id, DATE_FORMAT(bucket, '%Y-%m-%d %H:00:00'), SUM(n), MIN(orp_min), MAX(orp_max),
    SUM(orp_mean * n) / SUM(n), MIN(eh_min), MAX(eh_max), SUM(eh_mean * n) / SUM(n), MIN(temp_min), MAX(temp_max), SUM(temp_mean * n) / SUM(n),
    SUM(log_ratio_mean * n) / SUM(n), MIN(log_ratio_min), MAX(log_ratio_max) FROM rollups_1m GROUP BY 1, 2`);
  const a2 = tank('A2').id;
  const user = t.users.metallurgist;
  await t.sequelize.query(`INSERT INTO band_changes (tank_id, old_low, old_high, old_target, new_low, new_high, new_target, reason, requested_by, requested_at, needs_approval)
    VALUES (${a2}, 8, 25, 14, 20, 40, 30, 'Trial of a higher band', ${user}, ${sql(start + 480 * 60_000)}, 0)`);
  await t.sequelize.query(`INSERT INTO calibrations (tank_id, version, formal_potential_v, formal_coeff_v_per_k, valid_from, reason, created_by, created_at)
    VALUES (${tank('A1').id}, 2, 0.686, 0.0009, ${sql(start + 60 * 60_000)}, 'Refit after assays', ${user}, ${sql(start + 61 * 60_000)})`);
  await seedAlarms(start);
  await t.sequelize.query(`INSERT INTO assays (tank_id, sampled_at, fe2_g_per_l, fe_total_g_per_l, unit, fe2_entered, fe_total_entered, source, created_by, created_at)
    VALUES (${tank('A1').id}, ${sql(start + 120 * 60_000)}, 1, 11, 'g/L', 1, 11, 'test', ${user}, ${sql(start + 130 * 60_000)})`);
}

/**
 * Three alarms in the shift: A1 acknowledged after 5 min, B1 shelved (never acknowledged) with one
 * escalation e-mail sent, A2 acknowledged after 15 min and cleared.
 */
async function seedAlarms(start: number) {
  const at = (min: number) => sql(start + min * 60_000);
  const q = (text: string) => t.sequelize.query(text);
  const one = async <T extends object>(text: string) => (await t.sequelize.query<T>(text, { type: QueryTypes.SELECT }))[0];
  const alarm = async (tag: string, priority: number, events: [number, string, string, string][]) => {
    const tankId = tank(tag).id;
    // The demo seed may already define this alarm for the tank; reuse it.
    let def = await one<{ id: number }>(`SELECT id FROM alarm_definitions WHERE tank_id = ${tankId} AND kind = 'ratio-below-band'`);
    if (!def) {
      await q(`INSERT INTO alarm_definitions (tank_id, kind, priority, cause, consequence, action, response_min, created_at, updated_at)
        VALUES (${tankId}, 'ratio-below-band', ${priority}, 'c', 'c', 'a', 10, NOW(3), NOW(3))`);
      def = await one<{ id: number }>(`SELECT id FROM alarm_definitions WHERE tank_id = ${tankId} AND kind = 'ratio-below-band'`);
    }
    const closed = events.some((e) => e[1] === 'cleared') ? at(events[events.length - 1][0]) : 'NULL';
    await q(`INSERT INTO alarm_instances (definition_id, tank_id, priority, state, condition_active, opened_at, activated_at, closed_at)
      VALUES (${def!.id}, ${tankId}, ${priority}, 'normal', 0, ${at(events[0][0])}, ${at(events[0][0])}, ${closed})`);
    const inst = await one<{ id: number }>(`SELECT MAX(id) AS id FROM alarm_instances WHERE definition_id = ${def!.id}`);
    for (const [min, kind, from, to] of events) {
      await q(`INSERT INTO alarm_events (instance_id, definition_id, tank_id, at, kind, from_state, to_state, condition_active, how)
        VALUES (${inst!.id}, ${def!.id}, ${tankId}, ${at(min)}, '${kind}', '${from}', '${to}', 1, 'screen')`);
    }
    return inst!.id;
  };
  await alarm('A1', 1, [[30, 'activated', 'normal', 'unacknowledged'], [35, 'acknowledged', 'unacknowledged', 'acknowledged']]);
  const b1 = await alarm('B1', 2, [[100, 'activated', 'normal', 'unacknowledged'], [108, 'escalated', 'unacknowledged', 'unacknowledged'], [110, 'shelved', 'unacknowledged', 'shelved']]);
  await alarm('A2', 3, [[200, 'activated', 'normal', 'unacknowledged'], [215, 'acknowledged', 'unacknowledged', 'acknowledged'], [300, 'cleared', 'acknowledged', 'normal']]);
  await q(`INSERT INTO mail_outbox (instance_id, step, recipients, subject, text_body, html_body, message_id, status, next_attempt_at, created_at, sent_at)
    VALUES (${b1}, 1, '[]', 's', 't', 'h', 'm1', 'sent', ${at(108)}, ${at(108)}, ${at(108)})`);
}

describe('shift digest', () => {
  let d: DigestResponse;
  let a1: TankDigest;
  let a2: TankDigest;
  beforeAll(async () => {
    const res = await get(`/api/digest?shiftStart=${encodeURIComponent(shift.startsAt)}`);
    expect(res.status).toBe(200);
    d = res.body;
    a1 = d.tanks.find((x) => x.tag === 'A1')!;
    a2 = d.tanks.find((x) => x.tag === 'A2')!;
  });

  it('when a seeded shift is asked for, then time in band, above, below and no data come out in minutes', () => {
    expect(d.from).toBe(shift.startsAt);
    expect(d.to).toBe(shift.endsAt);
    expect(a1.minutes).toEqual({ inBand: 360, above: 120, below: 120, noData: 120, total: 720 });
  });

  it('when the band changed during the shift, then minutes after the change are judged against the new band', () => {
    expect(a2.bands.map((b) => [b.low, b.high])).toEqual([[8, 25], [20, 40]]);
    expect(a2.minutes).toEqual({ inBand: 480, above: 0, below: 120, noData: 120, total: 720 });
  });

  it('when figures are summarised, then the ratio is a geometric mean and ORP and temperature keep their ranges', () => {
    const geo = 10 ** ((360 * 1 + 120 * Math.log10(30) + 120 * Math.log10(4)) / 600);
    expect(a1.ratio!.mean).toBeCloseTo(geo, 9);
    expect(a1.ratio!.min).toBeCloseTo(4, 9);
    expect(a1.ratio!.max).toBeCloseTo(30, 9);
    expect(a1.orpMv).toEqual({ mean: 446, min: 395, max: 485 });
    expect(a1.tempC!.mean).toBeCloseTo(42, 9);
    const a3 = d.tanks.find((x) => x.tag === 'A3')!;
    expect(a3.ratio).toBeNull();
    expect(a3.minutes.noData).toBe(720);
  });

  it('when the sparkline is drawn, then the silent hours are gaps', () => {
    expect(a1.spark.t.length).toBeLessThanOrEqual(160);
    const gap = a1.spark.logRatio.slice(Math.ceil((380 / 720) * a1.spark.t.length), Math.floor((470 / 720) * a1.spark.t.length));
    expect(gap.length).toBeGreaterThan(0);
    expect(gap.every((v) => v === null)).toBe(true);
  });

  it('when alarms were raised, then counts, response times, escalations and the timeline come out', () => {
    expect(d.alarms).toMatchObject({ available: true, raised: 3, acknowledged: 2, shelved: 1, escalationsSent: 1, waiting: 1, ackMeanS: 600, ackMaxS: 900 });
    expect(d.alarms.timeline.map((a) => [a.tankTag, a.priority, a.acknowledgedAt !== null, a.shelvedAt !== null, a.clearedAt !== null]))
      .toEqual([['A1', 1, true, false, false], ['B1', 2, false, true, false], ['A2', 3, true, false, true]]);
  });

  it('when band changes, calibrations and assays happened in the shift, then they are listed', () => {
    expect(d.bandChanges.available).toBe(true);
    expect(d.bandChanges.items).toHaveLength(1);
    expect(d.bandChanges.items[0].summary).toContain('8–25 → 20–40');
    expect(d.calibrations.items.map((c) => c.tankTag)).toEqual(['A1']);
    expect(d.assays.items[0].summary).toContain('ratio 10.00');
    expect(d.probeChecks.available).toBe(true);
  });

  it('when a digest table is downloaded, then the CSV holds the same rows and figures as the screen, with units in the column names', async () => {
    const csv = async (table: string) => {
      const res = await get(`/api/digest/export?shiftStart=${encodeURIComponent(shift.startsAt)}&table=${table}`, 'operator');
      expect(res.status, res.text).toBe(200);
      expect(res.headers['content-disposition']).toMatch(new RegExp(`shift-digest-.*-${table}\\.csv`));
      expect(res.text.startsWith('\uFEFF'), 'byte-order mark').toBe(true);
      return parse(res.text, { columns: true, bom: true }) as Array<Record<string, string>>;
    };
    const tanksCsv = await csv('tanks');
    expect(tanksCsv.map((r) => r.tank)).toEqual(d.tanks.map((x) => x.tag));
    const a1Row = tanksCsv.find((r) => r.tank === 'A1')!;
    expect(a1Row).toMatchObject({ in_band_min: '360', above_min: '120', below_min: '120', no_data_min: '120', in_band_pct: '50', orp_mean_mv: '446', orp_min_mv: '395' });
    expect(Number(a1Row.ratio_geomean_fe3_fe2)).toBeCloseTo(a1.ratio!.mean, 9);
    expect(tanksCsv.find((r) => r.tank === 'A2')!.band_fe3_fe2).toBe('8-25 then 20-40');
    expect((await csv('alarms')).map((r) => [r.tank, r.priority])).toEqual([['A1', '1'], ['B1', '2'], ['A2', '3']]);
    expect((await csv('band-changes'))[0]!.what).toContain('8–25 → 20–40');
    expect((await csv('calibrations')).map((r) => r.tank)).toEqual(['A1']);
  });

  it('when the shift is closed with a handover note, then the default digest is that shift with its log', async () => {
    const sup = (path: string, body: object) => request(t.app).post(path).set('Cookie', t.cookies.supervisor).set('X-Ferrisight-Csrf', '1').send(body);
    await request(t.app).post('/api/shift-log/entries').set('Cookie', t.cookies.operator).set('X-Ferrisight-Csrf', '1').send({ body: 'Pump B2 restarted' });
    const current = (await get('/api/shift-log')).body.shift;
    expect((await sup('/api/shifts/close', { startsAt: current.startsAt, handoverNote: 'All tanks in band at handover' })).status).toBe(200);
    const res = await get('/api/digest', 'operator');
    expect(res.status).toBe(200);
    expect(res.body.shift).toMatchObject({ startsAt: current.startsAt, status: 'closed', handoverNote: 'All tanks in band at handover' });
    expect(res.body.log.map((e: { body: string }) => e.body)).toEqual(['Pump B2 restarted']);
  });

  it('when a free range is asked for, then the figures cover it and the range is checked', async () => {
    const from = shift.startsAt;
    const to = new Date(Date.parse(shift.startsAt) + 360 * 60_000).toISOString();
    const res = await get(`/api/digest?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`);
    expect(res.body.tanks.find((x: TankDigest) => x.tag === 'A1').minutes).toEqual({ inBand: 360, above: 0, below: 0, noData: 0, total: 360 });
    expect(res.body.shift).toBeNull();
    // A range off the hour and off the minute: 30 s into minute 330 up to minute 540 (silent 360–479).
    const odd = await get(`/api/digest?from=${encodeURIComponent(new Date(Date.parse(from) + 330 * 60_000 + 30_000).toISOString())}&to=${encodeURIComponent(new Date(Date.parse(from) + 540 * 60_000).toISOString())}`);
    const oddA1 = odd.body.tanks.find((x: TankDigest) => x.tag === 'A1');
    expect(oddA1.minutes).toEqual({ inBand: 29, above: 60, below: 0, noData: 120, total: 209 });
    expect(oddA1.ratio.max).toBeCloseTo(30, 9);
    expect(oddA1.orpMv.mean).toBeCloseTo((29 * 450 + 60 * 480) / 89, 9);
    expect((await get(`/api/digest?from=${encodeURIComponent(to)}&to=${encodeURIComponent(from)}`)).status).toBe(400);
    expect((await get(`/api/digest?from=${encodeURIComponent(from)}`)).status).toBe(400);
    expect((await get(`/api/digest?shiftStart=${encodeURIComponent(to)}`)).status).toBe(400);
  });
});
