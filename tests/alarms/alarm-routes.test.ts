import { parse } from 'csv-parse/sync';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { definitionsRepository } from '../../api/src/modules/alarms/definitions.repository.ts';
import { CIRCUIT_TEMPLATES } from '../../shared/alarms/templates.ts';
import type { Role } from '../../shared/schemas/auth.ts';
import { createAlarmTestApi, eventsOf, onlyDefinition, reading, testClock, withoutTimerDefinitions, type AlarmTestApi } from './helpers.ts';

let t: AlarmTestApi;
beforeAll(async () => {
  t = await createAlarmTestApi();
  await withoutTimerDefinitions(t.sequelize);
});
afterAll(async () => t?.close());

const get = (path: string, role: Role = 'operator') => request(t.app).get(path).set('Cookie', t.cookies[role]);
const post = (path: string, role: Role, body: object = {}) => request(t.app).post(path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body);

/** Raises a ratio-below-band alarm on a tank (now, real clock) and returns its instance id. */
async function raise(tag: string, ratio = 5): Promise<{ def: number; id: number }> {
  const def = await onlyDefinition(t.sequelize, t.tanks[tag].id, 'ratio-below-band', { on_delay_s: 0 });
  const clock = testClock(Date.now());
  await t.engine(clock).onReadings([reading(t, tag, clock.ms(), { ratio })]);
  const [row] = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_instances WHERE open_definition_id = ?', { replacements: [def], type: QueryTypes.SELECT });
  return { def, id: row.id };
}

describe('Alarm desk routes', () => {
  it('when an alarm is raised, then every role sees it in the active list with its rationalisation, and the summary counts it', async () => {
    const { id } = await raise('A1');
    const res = await get('/api/alarms/active');
    expect(res.status).toBe(200);
    const alarm = res.body.alarms.find((a: { id: number }) => a.id === id);
    expect(alarm).toMatchObject({ tankTag: 'A1', priority: 1, state: 'unacknowledged', kind: 'ratio-below-band', firstValue: 5, limitValue: 8 });
    expect(alarm.rationalisation.action.length).toBeGreaterThan(10);
    expect(res.body.lastEventId).toBeGreaterThan(0);
    const summary = await get('/api/alarms/summary');
    expect(summary.body.byPriority['1']).toMatchObject({ total: 1, unacknowledged: 1 });
  });

  it('when an operator acknowledges (the first responder, ISA-18.2), then the alarm is acknowledged as that person from the screen; a metallurgist may not', async () => {
    const { def, id } = await raise('A2');
    expect((await post(`/api/alarms/instances/${id}/acknowledge`, 'metallurgist')).status).toBe(403);
    const res = await post(`/api/alarms/instances/${id}/acknowledge`, 'operator', { comment: 'Blower restarted' });
    expect(res.status).toBe(200);
    expect(res.body.alarm).toMatchObject({ state: 'acknowledged', ackedBy: 'Test operator' });
    const last = (await eventsOf(t.sequelize, def)).at(-1)!;
    expect(last).toMatchObject({ kind: 'acknowledged', how: 'screen', by_user_id: t.users.operator, comment: 'Blower restarted' });
    expect((await post(`/api/alarms/instances/${id}/acknowledge`, 'supervisor')).status).toBe(409);
  });

  it('when the site lets operators shelve and shortens the longest shelve, then an operator may shelve within it; by default an operator may not', async () => {
    // Train B's band is 0.5–2 in the test plant: 0.2 is below it.
    const { id } = await raise('B3', 0.2);
    const body = { reason: 'Feed pump changeover', durationMin: 60 };
    expect((await post(`/api/alarms/instances/${id}/shelve`, 'operator', body)).status).toBe(403);
    const [{ siteId }] = await t.sequelize.query<{ siteId: number }>('SELECT c.site_id AS siteId FROM tanks t JOIN circuits c ON c.id = t.circuit_id WHERE t.id = ?', { replacements: [t.tanks.B3.id], type: QueryTypes.SELECT });
    const put = (key: string, value: number) => request(t.app).put('/api/site-settings').set('Cookie', t.cookies.admin).set('X-Ferrisight-Csrf', '1')
      .send({ siteId, key, value, reason: 'Alarm philosophy review' });
    expect((await put('operatorsMayShelve', 1)).status).toBe(200);
    expect((await put('maxShelveHours', 0.5)).status).toBe(200);
    try {
      const tooLong = await post(`/api/alarms/instances/${id}/shelve`, 'operator', body);
      expect(tooLong.status).toBe(400);
      expect(tooLong.body.errors).toEqual([{ path: 'durationMin', message: 'At most 0.5 h' }]);
      const res = await post(`/api/alarms/instances/${id}/shelve`, 'operator', { ...body, durationMin: 30 });
      expect(res.status).toBe(200);
      expect(res.body.alarm).toMatchObject({ state: 'shelved', shelvedBy: 'Test operator' });
    } finally {
      await put('operatorsMayShelve', 0);
      await put('maxShelveHours', 12);
    }
  });

  it('when an operator comments, then the comment joins the timeline without changing the state', async () => {
    const { id } = await raise('A3');
    expect((await post(`/api/alarms/instances/${id}/comment`, 'operator', { text: 'Sample taken for titration' })).status).toBe(201);
    const res = await get(`/api/alarms/instances/${id}`);
    expect(res.body.alarm.state).toBe('unacknowledged');
    expect(res.body.timeline.map((e: { kind: string }) => e.kind)).toEqual(['activated', 'commented']);
    expect(res.body.timeline[1]).toMatchObject({ byName: 'Test operator', how: 'screen', comment: 'Sample taken for titration' });
  });

  it('when shelving without a reason or for more than 12 h, then it is refused; with both, then it is shelved until then', async () => {
    const { id } = await raise('A4');
    expect((await post(`/api/alarms/instances/${id}/shelve`, 'engineer', { durationMin: 30 })).status).toBe(400);
    expect((await post(`/api/alarms/instances/${id}/shelve`, 'engineer', { reason: 'Pump swap', durationMin: 721 })).status).toBe(400);
    const tooLate = new Date(Date.now() + 13 * 3_600_000).toISOString();
    expect((await post(`/api/alarms/instances/${id}/shelve`, 'engineer', { reason: 'Pump swap', until: tooLate })).status).toBe(400);
    const res = await post(`/api/alarms/instances/${id}/shelve`, 'engineer', { reason: 'Pump swap', durationMin: 90 });
    expect(res.status).toBe(200);
    expect(res.body.alarm).toMatchObject({ state: 'shelved', shelvedReason: 'Pump swap', shelvedBy: 'Test engineer' });
    expect(Date.parse(res.body.alarm.shelvedUntil) - Date.now()).toBeGreaterThan(89 * 60_000);
    const back = await post(`/api/alarms/instances/${id}/unshelve`, 'engineer');
    expect(back.body.alarm.state).toBe('unacknowledged');
  });

  it('when a tank has several alarms waiting, then acknowledge-all acknowledges each with its own event', async () => {
    const tank = t.tanks.A5.id;
    await onlyDefinition(t.sequelize, tank, 'ratio-below-band', { on_delay_s: 0 });
    const template = CIRCUIT_TEMPLATES[0].definitions.find((d) => d.kind === 'temp-high')!;
    const tempDef = (await definitionsRepository.insert(t.sequelize, tank, { ...template, onDelayS: 0 }, new Date()))!;
    const clock = testClock(Date.now());
    await t.engine(clock).onReadings([reading(t, 'A5', clock.ms(), { ratio: 5, tempC: 55 })]);
    const res = await post(`/api/alarms/tanks/${tank}/acknowledge`, 'admin', {});
    expect(res.status).toBe(200);
    expect(res.body.acknowledged).toHaveLength(2);
    expect((await eventsOf(t.sequelize, tempDef)).map((e) => e.kind)).toEqual(['activated', 'acknowledged']);
  });

  it('when a metallurgist takes an alarm out of service with a reason and a period, then it is out of service until then; an engineer may not', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A6.id, 'orp-low');
    const oos = { reason: 'Probe pulled for cleaning', durationH: 4 };
    expect((await post(`/api/alarms/definitions/${def}/out-of-service`, 'engineer', oos)).status).toBe(403);
    const missing = await post(`/api/alarms/definitions/${def}/out-of-service`, 'metallurgist', { reason: 'Probe pulled for cleaning' });
    expect(missing.status).toBe(400);
    expect(missing.body.errors.map((e: { path: string }) => e.path)).toEqual(['durationH']);
    expect((await post(`/api/alarms/definitions/${def}/out-of-service`, 'metallurgist', { ...oos, durationH: 24 * 8 })).status).toBe(400);
    const res = await post(`/api/alarms/definitions/${def}/out-of-service`, 'metallurgist', oos);
    expect(res.body.alarm).toMatchObject({ state: 'out-of-service', oosReason: 'Probe pulled for cleaning' });
    expect(Date.parse(res.body.alarm.oosUntil) - Date.now()).toBeGreaterThan(4 * 3_600_000 - 60_000);
    const back = await post(`/api/alarms/definitions/${def}/return-to-service`, 'metallurgist', { comment: 'Cleaned, checked against ZoBell' });
    expect(back.body.alarm.state).toBe('normal');
  });

  it('when an out-of-service period runs out, then the alarm timers return it to service on their own and say so', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B4.id, 'orp-low');
    const res = await post(`/api/alarms/definitions/${def}/out-of-service`, 'admin', { reason: 'Probe pulled for cleaning', durationH: 2 });
    const ends = Date.parse(res.body.alarm.oosUntil);
    await t.engine(testClock(ends - 60_000)).tick();
    expect((await get(`/api/alarms/instances/${res.body.alarm.id}`)).body.alarm.state).toBe('out-of-service');
    await t.engine(testClock(ends + 1000)).tick();
    const after = (await get(`/api/alarms/instances/${res.body.alarm.id}`)).body;
    expect(after.alarm.state).toBe('normal');
    expect(after.timeline.at(-1)).toMatchObject({ kind: 'returned-to-service', how: 'automatic', comment: 'Out-of-service period ended' });
  });

  it('when a definition is edited, then a reason is required and the change is in the audit trail', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B1.id, 'orp-high');
    const path = `/api/alarms/definitions/${def}`;
    const patch = (role: Role, body: object) => request(t.app).patch(path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body);
    expect((await patch('metallurgist', { threshold: 650 })).status).toBe(400);
    expect((await patch('supervisor', { threshold: 650, reason: 'Tighter limit' })).status).toBe(403);
    const res = await patch('metallurgist', { threshold: 650, priority: 1, reason: 'New limit after trial' });
    expect(res.status).toBe(200);
    expect(res.body.definition).toMatchObject({ threshold: 650, priority: 1, limit: 650 });
    const [audit] = await t.sequelize.query<{ reason: string; user_id: number }>("SELECT reason, user_id FROM audit_log WHERE action = 'alarm-definition.update' AND entity_id = ?", { replacements: [String(def)], type: QueryTypes.SELECT });
    expect(audit).toEqual({ reason: 'New limit after trial', user_id: t.users.metallurgist });
  });

  it('when history is searched and exported, then episodes in the window come back as JSON and as CSV', async () => {
    const from = new Date(Date.now() - 3_600_000).toISOString();
    const to = new Date(Date.now() + 60_000).toISOString();
    const res = await get(`/api/alarms/history?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}&q=titration`);
    expect(res.body.alarms.map((a: { tankTag: string }) => a.tankTag)).toEqual(['A3']);
    const csv = await get(`/api/alarms/history/export?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text.split('\n')[0]).toMatch(/^id,site,circuit,tank,alarm,priority/);
    expect(csv.text).toMatch(/A2,Fe³⁺\/Fe²⁺ ratio below band,P1/);
  });

  it('when the site, circuit and tank tags and the acknowledging name start like formulas, then every such cell of the history CSV is escaped (OWASP "CSV Injection")', async () => {
    const from = new Date(Date.now() - 3_600_000).toISOString();
    const to = new Date(Date.now() + 60_000).toISOString();
    const evil = { site: '=HYPERLINK("http://evil.example")', circuit: '+cmd|calc', tank: '@SUM(1+1)', name: '-2+3' };
    const q = (sql: string, r: unknown[]) => t.sequelize.query(sql, { replacements: r });
    const [site] = await t.sequelize.query<{ id: number; tag: string }>('SELECT id, tag FROM sites ORDER BY id LIMIT 1', { type: QueryTypes.SELECT });
    const [circuit] = await t.sequelize.query<{ id: number; tag: string }>('SELECT c.id, c.tag FROM circuits c JOIN tanks k ON k.circuit_id = c.id WHERE k.id = ?', { replacements: [t.tanks.A2.id], type: QueryTypes.SELECT });
    await q('UPDATE sites SET tag = ? WHERE id = ?', [evil.site, site.id]);
    await q('UPDATE circuits SET tag = ? WHERE id = ?', [evil.circuit, circuit.id]);
    await q('UPDATE tanks SET tag = ? WHERE id = ?', [evil.tank, t.tanks.A2.id]);
    await q('UPDATE alarm_instances SET acked_by = ?, acked_at = COALESCE(acked_at, NOW(3)) WHERE tank_id = ?', [evil.name, t.tanks.A2.id]);
    try {
      const csv = await get(`/api/alarms/history/export?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`);
      const [header, ...data] = parse(csv.text) as string[][];
      const row = data.find((r) => r[header.indexOf('tank')] === `'${evil.tank}`)!;
      expect(row, csv.text).toBeDefined();
      expect(row[header.indexOf('site')]).toBe(`'${evil.site}`);
      expect(row[header.indexOf('circuit')]).toBe(`'${evil.circuit}`);
      expect(row[header.indexOf('acknowledged_by')]).toBe(`'${evil.name}`);
      // No cell anywhere may start a formula; numbers (ids, values, limits) are not text.
      const numeric = new Set(['id', 'seconds_to_acknowledge', 'value_at_activation', 'limit']);
      const textCells = data.flatMap((r) => r.filter((_, i) => !numeric.has(header[i]!)));
      expect(textCells.filter((c) => /^[=+\-@\t\r]/.test(c))).toEqual([]);
    } finally {
      await q('UPDATE sites SET tag = ? WHERE id = ?', [site.tag, site.id]);
      await q('UPDATE circuits SET tag = ? WHERE id = ?', [circuit.tag, circuit.id]);
      await q('UPDATE tanks SET tag = ? WHERE id = ?', ['A2', t.tanks.A2.id]);
    }
  });

  it('when a window holds more alarms than one page of the list, then the history CSV still holds every one of them once', async () => {
    const { def } = await raise('A4');
    // 5,100 closed alarms of that definition, a minute apart, ten days ago (an old window no other test uses).
    const start = Date.now() - 10 * 86_400_000;
    const n = 5100;
    await t.sequelize.query(
      `INSERT INTO alarm_instances (definition_id, tank_id, priority, state, condition_active, opened_at, activated_at, closed_at)
       WITH d (x) AS (SELECT 0 UNION ALL SELECT 1 UNION ALL SELECT 2 UNION ALL SELECT 3 UNION ALL SELECT 4
                      UNION ALL SELECT 5 UNION ALL SELECT 6 UNION ALL SELECT 7 UNION ALL SELECT 8 UNION ALL SELECT 9),
            seq (k) AS (SELECT a.x + 10 * b.x + 100 * c.x + 1000 * e.x FROM d a, d b, d c, d e)
       SELECT ?, ?, 1, 'normal', 0, TIMESTAMPADD(MINUTE, k, ?), TIMESTAMPADD(MINUTE, k, ?), TIMESTAMPADD(SECOND, k * 60 + 30, ?) FROM seq WHERE k < ?`,
      { replacements: [def, t.tanks.A4.id, new Date(start), new Date(start), new Date(start), n] },
    );
    const from = new Date(start - 60_000).toISOString();
    const to = new Date(start + (n + 1) * 60_000).toISOString();
    const csv = await get(`/api/alarms/history/export?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`);
    const [header, ...data] = parse(csv.text) as string[][];
    const ids = data.map((r) => r[header.indexOf('id')]);
    expect(ids.length).toBe(n);
    expect(new Set(ids).size).toBe(n);
  }, 60_000);

  it('when figures are asked for, then they count the alarms of the window and carry their targets', async () => {
    const from = new Date(Date.now() - 3_600_000).toISOString();
    const res = await get(`/api/alarms/figures?from=${encodeURIComponent(from)}&to=${encodeURIComponent(new Date().toISOString())}`);
    expect(res.status).toBe(200);
    expect(res.body.figures.total).toBeGreaterThanOrEqual(5);
    expect(res.body.targets.perHourMax).toMatchObject({ value: 12, confidence: 'M' });
    expect(res.body.figures.timeToAck.count).toBeGreaterThanOrEqual(1);
  });

  it('when events after an id are asked for, then they come in id order (the fallback when the socket is down)', async () => {
    const res = await get('/api/alarms/events?after=0&limit=5');
    const ids = res.body.events.map((e: { id: number }) => e.id);
    expect(ids).toEqual([...ids].sort((a, b) => a - b));
    expect(res.body.events[0]).toMatchObject({ siteTag: 'kestrel', alarmKind: expect.any(String) });
  });
});
