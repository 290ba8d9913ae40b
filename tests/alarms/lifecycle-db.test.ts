import fc from 'fast-check';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSequelize } from '../../api/src/db/sequelize.ts';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { ALARM_ACTIONS, transition, type AlarmStatus } from '../../shared/alarms/states.ts';
import { createAlarmTestApi, eventsOf, onlyDefinition, type AlarmTestApi } from './helpers.ts';

let t: AlarmTestApi;
beforeAll(async () => {
  t = await createAlarmTestApi();
});
afterAll(async () => t?.close());

const actor = { userId: null, name: 'test', how: 'screen' as const };

describe('alarm lifecycle in the database', () => {
  it('when random action sequences are applied, then the database follows the state machine, one instance is open at most and history only grows', async () => {
    const defId = await onlyDefinition(t.sequelize, t.tanks.A1.id, 'ratio-below-band');
    let at = Date.parse('2026-12-01T00:00:00Z');
    await fc.assert(fc.asyncProperty(fc.array(fc.constantFrom(...ALARM_ACTIONS.filter((a) => a !== 'comment')), { minLength: 1, maxLength: 25 }), async (actions) => {
      let model: AlarmStatus = { state: 'normal', conditionActive: false };
      const [open] = await t.sequelize.query<{ state: AlarmStatus['state']; condition_active: number }>(
        'SELECT state, condition_active FROM alarm_instances WHERE open_definition_id = ?', { replacements: [defId], type: QueryTypes.SELECT });
      if (open) model = { state: open.state, conditionActive: open.condition_active === 1 };
      for (const action of actions) {
        const before = await eventsOf(t.sequelize, defId);
        at += 1000;
        const result = await applyAction(t.sequelize, { definitionId: defId, action, at: new Date(at), actor, reason: 'property test', shelvedUntil: new Date(at + 60_000) });
        const want = transition(model, action);
        expect(result.ok).toBe(want.ok);
        if (want.ok) model = want.to;
        const after = await eventsOf(t.sequelize, defId);
        // Append-only: what was there is still there, unchanged; exactly one new row per accepted action.
        expect(after.slice(0, before.length)).toEqual(before);
        expect(after.length).toBe(before.length + (want.ok ? 1 : 0));
        const openRows = await t.sequelize.query<{ state: string; condition_active: number }>(
          'SELECT state, condition_active FROM alarm_instances WHERE open_definition_id = ?', { replacements: [defId], type: QueryTypes.SELECT });
        expect(openRows.length).toBeLessThanOrEqual(1);
        if (model.state === 'normal') expect(openRows).toEqual([]);
        else expect(openRows[0]).toEqual({ state: model.state, condition_active: model.conditionActive ? 1 : 0 });
      }
    }), { numRuns: 15 });
  });

  it('when someone tries to change or delete an alarm event, then the database refuses', async () => {
    const defId = await onlyDefinition(t.sequelize, t.tanks.A2.id, 'ratio-below-band');
    await applyAction(t.sequelize, { definitionId: defId, action: 'activate', at: new Date(), actor });
    const [e] = await eventsOf(t.sequelize, defId);
    await expect(t.sequelize.query("UPDATE alarm_events SET comment = 'rewritten' WHERE id = ?", { replacements: [e.id] })).rejects.toThrow(/append-only/);
    await expect(t.sequelize.query('DELETE FROM alarm_events WHERE id = ?', { replacements: [e.id] })).rejects.toThrow(/append-only/);
    expect((await eventsOf(t.sequelize, defId))[0]).toEqual(e);
  });

  it('when two processes activate the same condition at once, then one instance opens and the other is refused', async () => {
    const defId = await onlyDefinition(t.sequelize, t.tanks.A3.id, 'ratio-below-band');
    const other = createSequelize(t.databaseUrl, 4);
    try {
      const results = await Promise.all([t.sequelize, other, t.sequelize, other].map((db) =>
        applyAction(db, { definitionId: defId, action: 'activate', at: new Date(), actor: { userId: null, name: null, how: 'automatic' } })));
      expect(results.filter((r) => r.ok)).toHaveLength(1);
      const [n] = await t.sequelize.query<{ n: number }>('SELECT COUNT(*) AS n FROM alarm_instances WHERE definition_id = ?', { replacements: [defId], type: QueryTypes.SELECT });
      expect(n.n).toBe(1);
    } finally {
      await other.close();
    }
  });

  it('when events are written concurrently, then their ids commit in order (a reader of id > last misses none)', async () => {
    const defs = await Promise.all(['A4', 'A5', 'A6'].map((tag) => onlyDefinition(t.sequelize, t.tanks[tag].id, 'ratio-below-band')));
    const other = createSequelize(t.databaseUrl, 4);
    const seen: number[] = [];
    let last = 0;
    let stop = false;
    const reader = (async () => {
      while (!stop) {
        const rows = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_events WHERE id > ? ORDER BY id', { replacements: [last], type: QueryTypes.SELECT });
        for (const r of rows) {
          seen.push(r.id);
          last = r.id;
        }
      }
    })();
    try {
      await Promise.all(defs.flatMap((d, i) => Array.from({ length: 10 }, (_, k) =>
        applyAction(i % 2 ? other : t.sequelize, { definitionId: d, action: k % 2 ? 'clear' : 'activate', at: new Date(), actor }))));
    } finally {
      stop = true;
      await reader;
      await other.close();
    }
    const rows = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_events WHERE id > ? ORDER BY id', { replacements: [last], type: QueryTypes.SELECT });
    seen.push(...rows.map((r) => r.id));
    const all = await t.sequelize.query<{ id: number }>('SELECT id FROM alarm_events WHERE definition_id IN (:defs) ORDER BY id', { replacements: { defs }, type: QueryTypes.SELECT });
    expect(all.map((r) => r.id).every((id) => seen.includes(id))).toBe(true);
  });
});
