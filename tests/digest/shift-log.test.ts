import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../shared/schemas/auth.ts';
import { createTestApi, type TestApi } from '../helpers/api.ts';

let t: TestApi;
beforeAll(async () => {
  t = await createTestApi();
});
afterAll(async () => t?.close());

const as = (role: Role) => ({
  get: (path: string) => request(t.app).get(path).set('Cookie', t.cookies[role]),
  post: (path: string, body: object) => request(t.app).post(path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body),
  patch: (path: string, body: object) => request(t.app).patch(path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body),
  put: (path: string, body: object) => request(t.app).put(path).set('Cookie', t.cookies[role]).set('X-Ferrisight-Csrf', '1').send(body),
});

describe('shift pattern', () => {
  it('when nobody saved a pattern, then the site runs two 12-h shifts from 06:00 in its own time zone', async () => {
    const res = await as('operator').get('/api/shifts/pattern');
    expect(res.body.pattern).toMatchObject({ shiftsPerDay: 2, firstStart: '06:00', timeZone: 'Australia/Perth', saved: false });
  });

  it('when an admin saves three 8-h shifts, then the shift list follows them; others may not change it', async () => {
    expect((await as('supervisor').put('/api/shifts/pattern', { shiftsPerDay: 3, firstStart: '07:00' })).status).toBe(403);
    expect((await as('admin').put('/api/shifts/pattern', { shiftsPerDay: 4, firstStart: '07:00' })).status).toBe(400);
    const saved = await as('admin').put('/api/shifts/pattern', { shiftsPerDay: 3, firstStart: '07:00' });
    expect(saved.body.pattern).toMatchObject({ shiftsPerDay: 3, firstStart: '07:00', saved: true });
    const list = await as('operator').get('/api/shifts?count=4');
    expect(list.body.shifts).toHaveLength(4);
    for (const s of list.body.shifts) expect(Date.parse(s.endsAt) - Date.parse(s.startsAt)).toBe(8 * 3_600_000);
    // 07:00, 15:00, 23:00 in Perth (UTC+8) are 23:00, 07:00, 15:00 UTC.
    expect(list.body.shifts.map((s: { startsAt: string }) => s.startsAt.slice(11, 16)).sort()).toEqual(expect.arrayContaining(['07:00', '15:00']));
    expect(list.body.shifts[0].status).toBe('open');
  });
});

describe('shift log', () => {
  it('when an operator writes an entry about a tank, then it lands in the current shift with the author', async () => {
    const plant = (await as('operator').get('/api/plant')).body;
    const tankId = plant.sites[0].circuits[0].tanks[0].id;
    const res = await as('operator').post('/api/shift-log/entries', { body: 'A1 froth rising, checked the antifoam pump', tankId });
    expect(res.status).toBe(201);
    expect(res.body.entry).toMatchObject({ body: 'A1 froth rising, checked the antifoam pump', tank: { id: tankId, tag: 'A1' }, author: { name: 'Test operator' } });
    const log = await as('engineer').get('/api/shift-log');
    expect(log.body.shift.status).toBe('open');
    expect(log.body.entries.map((e: { id: number }) => e.id)).toContain(res.body.entry.id);
  });

  it('when someone else tries to change an entry, then it is refused; the author may reword it while the shift is open', async () => {
    const { entry } = (await as('operator').post('/api/shift-log/entries', { body: 'B2 temperature 79 °C' })).body;
    expect((await as('supervisor').patch(`/api/shift-log/entries/${entry.id}`, { body: 'changed by someone else' })).status).toBe(403);
    const edited = await as('operator').patch(`/api/shift-log/entries/${entry.id}`, { body: 'B2 temperature 78.5 °C' });
    expect(edited.status).toBe(200);
    expect(edited.body.entry.body).toBe('B2 temperature 78.5 °C');
    expect(edited.body.entry.editedAt).not.toBeNull();
  });

  it('when the supervisor closes the shift, then its entries are frozen and a correction is appended to the next shift', async () => {
    const { entry } = (await as('operator').post('/api/shift-log/entries', { body: 'A3 ratio 12 at 14:00' })).body;
    const current = (await as('supervisor').get('/api/shift-log')).body.shift;
    expect((await as('operator').post('/api/shifts/close', { startsAt: current.startsAt, handoverNote: 'x' })).status).toBe(403);
    const closed = await as('supervisor').post('/api/shifts/close', { startsAt: current.startsAt, handoverNote: 'Quiet shift. Watch A1 froth.' });
    expect(closed.status).toBe(200);
    expect(closed.body.shift).toMatchObject({ status: 'closed', handoverNote: 'Quiet shift. Watch A1 froth.', closedBy: { name: 'Test supervisor' } });
    expect((await as('supervisor').post('/api/shifts/close', { startsAt: current.startsAt, handoverNote: 'again' })).status).toBe(409);

    const edit = await as('operator').patch(`/api/shift-log/entries/${entry.id}`, { body: 'A3 ratio 21 at 14:00' });
    expect(edit.status).toBe(409);
    const fix = await as('operator').post('/api/shift-log/entries', { body: 'Correction: A3 ratio was 21, not 12', correctsId: entry.id });
    expect(fix.status).toBe(201);
    expect(fix.body.entry.correctsId).toBe(entry.id);
    expect(fix.body.entry.shiftId).not.toBe(entry.shiftId);

    const old = (await as('operator').get(`/api/shift-log?at=${encodeURIComponent(current.startsAt)}`)).body;
    expect(old.shift.status).toBe('closed');
    expect(old.entries.find((e: { id: number }) => e.id === entry.id).body).toBe('A3 ratio 12 at 14:00');
    const next = (await as('operator').get('/api/shift-log')).body;
    expect(next.shift.startsAt).toBe(current.endsAt);
    expect(next.entries.map((e: { id: number }) => e.id)).toContain(fix.body.entry.id);
  });

  it('when the shift asked to close has not started or does not start then, then it is refused', async () => {
    const future = new Date(Date.now() + 3 * 86_400_000);
    const list = (await as('supervisor').get('/api/shifts?count=1')).body.shifts[0];
    expect((await as('supervisor').post('/api/shifts/close', { startsAt: new Date(Date.parse(list.startsAt) + 60_000).toISOString(), handoverNote: 'n' })).status).toBe(400);
    expect((await as('supervisor').post('/api/shifts/close', { startsAt: future.toISOString(), handoverNote: 'n' })).status).toBe(400);
  });

  it('when an entry names a tank or an entry that does not exist, then it is refused', async () => {
    expect((await as('operator').post('/api/shift-log/entries', { body: 'x', tankId: 99999 })).status).toBe(400);
    expect((await as('operator').post('/api/shift-log/entries', { body: 'x', correctsId: 99999 })).status).toBe(400);
    expect((await as('operator').post('/api/shift-log/entries', { body: 'x', alarmId: 99999 })).status).toBe(400);
    expect((await as('operator').post('/api/shift-log/entries', { body: '   ' })).status).toBe(400);
  });
});
