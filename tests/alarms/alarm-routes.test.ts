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
async function raise(tag: string): Promise<{ def: number; id: number }> {
  const def = await onlyDefinition(t.sequelize, t.tanks[tag].id, 'ratio-below-band', { on_delay_s: 0 });
  const clock = testClock(Date.now());
  await t.engine(clock).onReadings([reading(t, tag, clock.ms(), { ratio: 5 })]);
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

  it('when an operator tries to acknowledge, then it is refused; when a supervisor does, then the alarm is acknowledged as that person from the screen', async () => {
    const { def, id } = await raise('A2');
    expect((await post(`/api/alarms/instances/${id}/acknowledge`, 'operator')).status).toBe(403);
    const res = await post(`/api/alarms/instances/${id}/acknowledge`, 'supervisor', { comment: 'Blower restarted' });
    expect(res.status).toBe(200);
    expect(res.body.alarm).toMatchObject({ state: 'acknowledged', ackedBy: 'Test supervisor' });
    const last = (await eventsOf(t.sequelize, def)).at(-1)!;
    expect(last).toMatchObject({ kind: 'acknowledged', how: 'screen', by_user_id: t.users.supervisor, comment: 'Blower restarted' });
    expect((await post(`/api/alarms/instances/${id}/acknowledge`, 'supervisor')).status).toBe(409);
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

  it('when a metallurgist takes an alarm out of service with a reason, then it is out of service; an engineer may not', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A6.id, 'orp-low');
    expect((await post(`/api/alarms/definitions/${def}/out-of-service`, 'engineer', { reason: 'Probe pulled for cleaning' })).status).toBe(403);
    expect((await post(`/api/alarms/definitions/${def}/out-of-service`, 'metallurgist', {})).status).toBe(400);
    const res = await post(`/api/alarms/definitions/${def}/out-of-service`, 'metallurgist', { reason: 'Probe pulled for cleaning' });
    expect(res.body.alarm).toMatchObject({ state: 'out-of-service', oosReason: 'Probe pulled for cleaning' });
    const back = await post(`/api/alarms/definitions/${def}/return-to-service`, 'metallurgist', { comment: 'Cleaned, checked against ZoBell' });
    expect(back.body.alarm.state).toBe('normal');
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
