import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/schemas/auth.ts';
import { createAlarmTestApi, type AlarmTestApi } from './helpers.ts';

let t: AlarmTestApi;
beforeAll(async () => {
  t = await createAlarmTestApi();
});
afterAll(async () => t?.close());

const send = (method: 'post' | 'patch' | 'put' | 'delete', path: string, role: Role, body: object) =>
  request(t.app)[method](path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body);
const get = (path: string, role: Role = 'operator') => request(t.app).get(path).set('Cookie', t.cookies[role]);
const H = 3_600_000;

describe('Call roster', () => {
  it('when the demo plant is seeded, then someone is on call now in each role and the policy escalates P1 in two steps', async () => {
    const now = await get('/api/roster/now');
    expect(now.status).toBe(200);
    expect(new Set(now.body.shifts.map((s: { roleOnCall: string }) => s.roleOnCall))).toEqual(new Set(['primary', 'backup', 'supervisor']));
    expect(now.body.shifts.every((s: { email: string }) => s.email.endsWith('@kestrel.example'))).toBe(true);
    const policy = await get('/api/roster/policy');
    expect(policy.body.steps.filter((s: { priority: number }) => s.priority === 1)).toEqual([
      { priority: 1, step: 1, afterMin: 5, notify: ['primary'] },
      { priority: 1, step: 2, afterMin: 15, notify: ['supervisor', 'backup'] },
    ]);
  });

  it('when a supervisor adds a shift, then it shows in the roster and is audited; an engineer may not add one', async () => {
    const shift = { personName: 'Wren Holloway', email: 'wren.holloway@kestrel.example', roleOnCall: 'backup', startsAt: new Date(Date.now() + 30 * 24 * H).toISOString(), endsAt: new Date(Date.now() + 30 * 24 * H + 12 * H).toISOString() };
    expect((await send('post', '/api/roster/shifts', 'engineer', shift)).status).toBe(403);
    const res = await send('post', '/api/roster/shifts', 'supervisor', shift);
    expect(res.status).toBe(201);
    expect(res.body.shift).toMatchObject({ personName: 'Wren Holloway', roleOnCall: 'backup' });
    const list = await get(`/api/roster/shifts?from=${encodeURIComponent(shift.startsAt)}&to=${encodeURIComponent(shift.endsAt)}`);
    expect(list.body.shifts.map((s: { personName: string }) => s.personName)).toContain('Wren Holloway');
    const [audit] = await t.sequelize.query<{ user_id: number }>("SELECT user_id FROM audit_log WHERE action = 'roster.create'", { type: QueryTypes.SELECT });
    expect(audit.user_id).toBe(t.users.supervisor);
  });

  it('when a shift ends before it starts, then it is refused with the field named', async () => {
    const res = await send('post', '/api/roster/shifts', 'admin', { personName: 'X', email: 'x@kestrel.example', roleOnCall: 'primary', startsAt: '2026-12-02T10:00:00Z', endsAt: '2026-12-02T09:00:00Z' });
    expect(res.status).toBe(400);
    expect(res.body.errors[0].path).toBe('endsAt');
  });

  it('when a rotation is generated, then people take back-to-back turns', async () => {
    const startsAt = new Date(Date.now() + 60 * 24 * H).toISOString();
    const res = await send('post', '/api/roster/rotation', 'admin', {
      people: [{ personName: 'Ida Brandt', email: 'ida.brandt@kestrel.example' }, { personName: 'Tavi Kern', email: 'tavi.kern@kestrel.example' }],
      roleOnCall: 'primary', startsAt, shiftHours: 12, count: 4,
    });
    expect(res.status).toBe(201);
    const list = await get(`/api/roster/shifts?from=${encodeURIComponent(startsAt)}&to=${encodeURIComponent(new Date(Date.parse(startsAt) + 48 * H).toISOString())}`);
    expect(list.body.shifts.map((s: { personName: string }) => s.personName)).toEqual(['Ida Brandt', 'Tavi Kern', 'Ida Brandt', 'Tavi Kern']);
  });

  it('when a shift is removed, then a reason is required and recorded', async () => {
    const list = await get('/api/roster/shifts');
    const id = list.body.shifts[0].id;
    expect((await send('delete', `/api/roster/shifts/${id}`, 'supervisor', {})).status).toBe(400);
    expect((await send('delete', `/api/roster/shifts/${id}`, 'supervisor', { reason: 'Swapped with a colleague' })).status).toBe(204);
    const [audit] = await t.sequelize.query<{ reason: string }>("SELECT reason FROM audit_log WHERE action = 'roster.remove'", { type: QueryTypes.SELECT });
    expect(audit.reason).toBe('Swapped with a colleague');
  });

  it('when the policy of a priority is replaced, then its steps are renumbered in time order and out-of-order steps are refused', async () => {
    expect((await send('put', '/api/roster/policy', 'admin', { priority: 3, steps: [{ afterMin: 60, notify: ['primary'] }, { afterMin: 30, notify: ['backup'] }], reason: 'x y z' })).status).toBe(400);
    const res = await send('put', '/api/roster/policy', 'admin', { priority: 3, steps: [{ afterMin: 120, notify: ['primary'] }], reason: 'Low priority gets a mail after 2 h' });
    expect(res.body.steps).toEqual([{ priority: 3, step: 1, afterMin: 120, notify: ['primary'] }]);
  });

  it('when a supervisor clears a priority, then it sends no e-mail; an engineer may not change the policy; bad steps are named by path', async () => {
    expect((await send('put', '/api/roster/policy', 'engineer', { priority: 2, steps: [], reason: 'Screens only' })).status).toBe(403);
    const bad = await send('put', '/api/roster/policy', 'supervisor', { priority: 2, steps: [{ afterMin: 0, notify: [] }], reason: 'Trying' });
    expect(bad.status).toBe(400);
    expect(bad.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(bad.body.errors).toEqual(expect.arrayContaining([
      { path: 'steps.0.afterMin', message: 'At least 1 minute' },
      { path: 'steps.0.notify', message: 'Pick whom to notify' },
    ]));
    const res = await send('put', '/api/roster/policy', 'supervisor', { priority: 2, steps: [], reason: 'Medium shows on screens only' });
    expect(res.status).toBe(200);
    expect(res.body.steps).toEqual([]);
    expect((await get('/api/roster/policy')).body.steps.filter((s: { priority: number }) => s.priority === 2)).toEqual([]);
    const [audit] = await t.sequelize.query<{ reason: string; user_id: number }>(
      "SELECT reason, user_id FROM audit_log WHERE action = 'escalation.update' AND entity_id = '2' ORDER BY id DESC LIMIT 1", { type: QueryTypes.SELECT });
    expect(audit).toEqual({ reason: 'Medium shows on screens only', user_id: t.users.supervisor });
  });
});
