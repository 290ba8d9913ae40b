/**
 * The alarm definition routes as the Alarm desk's definitions view uses them: list per tank,
 * partial edits with a reason, circuit templates, and the problem+json answers the forms show.
 */
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { TANK_ALARM_KINDS } from '../../shared/alarms/kinds.ts';
import { CIRCUIT_TEMPLATES } from '../../shared/alarms/templates.ts';
import type { Role } from '../../shared/schemas/auth.ts';
import { createAlarmTestApi, onlyDefinition, type AlarmTestApi } from './helpers.ts';

let t: AlarmTestApi;
beforeAll(async () => {
  t = await createAlarmTestApi();
});
afterAll(async () => t?.close());

const get = (path: string, role: Role = 'operator') => request(t.app).get(path).set('Cookie', t.cookies[role]);
const send = (method: 'post' | 'patch', path: string, role: Role, body: object) =>
  request(t.app)[method](path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body);

async function kindsOf(tankId: number): Promise<string[]> {
  const rows = await t.sequelize.query<{ kind: string }>('SELECT kind FROM alarm_definitions WHERE tank_id = ? ORDER BY kind', { replacements: [tankId], type: QueryTypes.SELECT });
  return rows.map((r) => r.kind);
}

describe('Alarm definition routes', () => {
  it('when a tank is asked for, then only its definitions come back, each with label, units and the limit in force', async () => {
    const res = await get(`/api/alarms/definitions?tank=${t.tanks.A2.id}`);
    expect(res.status).toBe(200);
    expect(res.body.definitions.length).toBeGreaterThan(0);
    expect(res.body.definitions.every((d: { tankId: number }) => d.tankId === t.tanks.A2.id)).toBe(true);
    const below = res.body.definitions.find((d: { kind: string }) => d.kind === 'ratio-below-band');
    expect(below).toMatchObject({ tankTag: 'A2', label: 'Fe³⁺/Fe²⁺ ratio below band', deadbandUnit: '%', threshold: null, limit: 8 });
    expect(below.rationalisation).toEqual(expect.objectContaining({ responseMin: expect.any(Number) }));
  });

  it('when one part of the rationalisation is edited, then the other parts stay as they were', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A3.id, 'orp-rate');
    const before = (await get(`/api/alarms/definitions?tank=${t.tanks.A3.id}`)).body.definitions.find((d: { id: number }) => d.id === def);
    const res = await send('patch', `/api/alarms/definitions/${def}`, 'admin', { rationalisation: { action: 'Look at the trend now' }, reason: 'Shorter instruction' });
    expect(res.status).toBe(200);
    expect(res.body.definition.rationalisation).toEqual({ ...before.rationalisation, action: 'Look at the trend now' });
    expect(res.body.definition).toMatchObject({ threshold: before.threshold, windowS: before.windowS });
  });

  it('when a threshold kind loses its threshold or a text is blanked, then a 400 problem names each field by path', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A4.id, 'temp-high');
    const res = await send('patch', `/api/alarms/definitions/${def}`, 'metallurgist', { threshold: null, reason: 'Trying without a limit' });
    expect(res.status).toBe(400);
    expect(res.headers['content-type']).toMatch(/application\/problem\+json/);
    expect(res.body.errors).toEqual([{ path: 'threshold', message: 'Temperature high needs a threshold (°C)' }]);
    const blank = await send('patch', `/api/alarms/definitions/${def}`, 'metallurgist', { rationalisation: { cause: '' }, reason: 'Blank cause' });
    expect(blank.status).toBe(400);
    expect(blank.body.errors).toEqual([{ path: 'rationalisation.cause', message: 'Enter the likely cause' }]);
    const nothing = await send('patch', `/api/alarms/definitions/${def}`, 'metallurgist', { reason: 'Only a reason' });
    expect(nothing.status).toBe(400);
    expect(nothing.body.errors.map((e: { message: string }) => e.message)).toEqual(['Nothing to change']);
  });

  it('when templates are listed, then every template covers every alarm kind once', async () => {
    const res = await get('/api/alarms/templates', 'engineer');
    expect(res.status).toBe(200);
    expect(res.body.templates.map((x: { id: string }) => x.id)).toEqual(CIRCUIT_TEMPLATES.map((x) => x.id));
    for (const template of res.body.templates) expect(template.definitions.map((d: { kind: string }) => d.kind).sort()).toEqual([...TANK_ALARM_KINDS].sort());
  });

  it('when a template is applied, then only the missing definitions are created, the reason is audited, and a second run creates none', async () => {
    const tank = t.tanks.B3.id;
    await t.sequelize.query("DELETE FROM alarm_definitions WHERE tank_id = ? AND kind IN ('orp-low', 'probe-noisy') AND id NOT IN (SELECT definition_id FROM alarm_instances)", { replacements: [tank] });
    expect(await kindsOf(tank)).not.toContain('orp-low');
    const templateId = CIRCUIT_TEMPLATES[1].id;

    expect((await send('post', '/api/alarms/templates/apply', 'metallurgist', { templateId, tankIds: [tank] })).status).toBe(400);
    expect((await send('post', '/api/alarms/templates/apply', 'supervisor', { templateId, tankIds: [tank], reason: 'New tank' })).status).toBe(403);
    expect((await send('post', '/api/alarms/templates/apply', 'metallurgist', { templateId: 'no-such', tankIds: [tank], reason: 'New tank' })).status).toBe(404);

    const res = await send('post', '/api/alarms/templates/apply', 'metallurgist', { templateId, tankIds: [tank], reason: 'Probe alarms restored' });
    expect(res.status).toBe(201);
    expect(res.body.created).toHaveLength(2);
    expect(await kindsOf(tank)).toEqual([...TANK_ALARM_KINDS].sort());
    const [audit] = await t.sequelize.query<{ reason: string; user_id: number; entity_id: string }>(
      "SELECT reason, user_id, entity_id FROM audit_log WHERE action = 'alarm-definition.apply-template' ORDER BY id DESC LIMIT 1", { type: QueryTypes.SELECT });
    expect(audit).toEqual({ reason: 'Probe alarms restored', user_id: t.users.metallurgist, entity_id: templateId });

    const again = await send('post', '/api/alarms/templates/apply', 'admin', { templateId, tankIds: [tank], reason: 'Run twice' });
    expect(again.body.created).toEqual([]);
  });
});
