import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { applyAction } from '../../api/src/modules/alarms/lifecycle.ts';
import { recordProbeCheck } from '../../api/src/modules/alarms/alarm-inputs.repository.ts';
import { createAlarmTestApi, eventsOf, withoutTimerDefinitions, instancesOf, MIN, onlyDefinition, reading, testClock, type AlarmTestApi } from './helpers.ts';

let t: AlarmTestApi;
beforeAll(async () => {
  t = await createAlarmTestApi();
  await withoutTimerDefinitions(t.sequelize);
});
afterAll(async () => t?.close());

/** Readings every 5 s from the clock's time for `seconds`, ratio from f(seconds since start). */
async function feed(engine: ReturnType<AlarmTestApi['engine']>, clock: ReturnType<typeof testClock>, tag: string, seconds: number, ratio: (s: number) => number) {
  const start = clock.ms();
  for (let s = 0; s <= seconds; s += 5) {
    clock.set(start + s * 1000);
    await engine.onReadings([reading(t, tag, clock.ms(), { ratio: ratio(s) })]);
  }
}

describe('alarm engine', () => {
  it('when the ratio falls below band for the on-delay, then one unacknowledged P1 alarm opens with the value and the band limit', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A1.id, 'ratio-below-band', { on_delay_s: 30, deadband: 5 });
    const clock = testClock();
    const engine = t.engine(clock);
    await feed(engine, clock, 'A1', 25, () => 6);
    expect(await instancesOf(t.sequelize, def)).toEqual([]);
    await feed(engine, clock, 'A1', 10, () => 6);
    const [inst] = await instancesOf(t.sequelize, def);
    expect(inst.state).toBe('unacknowledged');
    const [ev] = await eventsOf(t.sequelize, def);
    expect(ev).toMatchObject({ kind: 'activated', from_state: 'normal', to_state: 'unacknowledged', how: 'automatic', value: 6 });
  });

  it('when the ratio chatters around the limit inside the deadband, then no second instance opens', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A2.id, 'ratio-below-band', { on_delay_s: 0, off_delay_s: 20, deadband: 10 });
    const clock = testClock();
    const engine = t.engine(clock);
    // 7.9 / 8.5 alternate: below 8 then back, but never past 8.8 (deadband 10 %).
    await feed(engine, clock, 'A2', 300, (s) => (s % 10 === 0 ? 7.9 : 8.5));
    const list = await instancesOf(t.sequelize, def);
    expect(list).toHaveLength(1);
    expect((await eventsOf(t.sequelize, def)).map((e) => e.kind)).toEqual(['activated']);
  });

  it('when the ratio recovers past the deadband for the off-delay, then the alarm returns to normal unacknowledged, and acknowledging closes it', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A3.id, 'ratio-below-band', { on_delay_s: 0, off_delay_s: 30, deadband: 5 });
    const clock = testClock();
    const engine = t.engine(clock);
    await feed(engine, clock, 'A3', 10, () => 6);
    await feed(engine, clock, 'A3', 25, () => 12);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    await feed(engine, clock, 'A3', 10, () => 12);
    const [inst] = await instancesOf(t.sequelize, def);
    expect(inst.state).toBe('rtn-unacknowledged');
    await applyAction(t.sequelize, { instanceId: inst.id, action: 'acknowledge', at: clock.now(), actor: { userId: null, name: 'Test', how: 'screen' } });
    expect((await instancesOf(t.sequelize, def))[0]).toMatchObject({ state: 'normal', open_definition_id: null });
  });

  it('when the band is changed, then the next reading is judged against the new band at once', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A4.id, 'ratio-above-band', { on_delay_s: 0 });
    const clock = testClock();
    const engine = t.engine(clock);
    await engine.onReadings([reading(t, 'A4', clock.ms(), { ratio: 20 })]);
    expect(await instancesOf(t.sequelize, def)).toEqual([]);
    await t.sequelize.query('UPDATE tanks SET band_high = 15 WHERE id = ?', { replacements: [t.tanks.A4.id] });
    clock.advance(5000);
    await engine.onReadings([reading(t, 'A4', clock.ms(), { ratio: 20 })]);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    await t.sequelize.query('UPDATE tanks SET band_high = 25 WHERE id = ?', { replacements: [t.tanks.A4.id] });
  });

  it('when the tank is marked offline, then its alarm is suppressed by design, and back online it re-annunciates while still active', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A5.id, 'ratio-below-band', { on_delay_s: 0 });
    const clock = testClock();
    const engine = t.engine(clock);
    await engine.onReadings([reading(t, 'A5', clock.ms(), { ratio: 5 })]);
    const [inst] = await instancesOf(t.sequelize, def);
    await applyAction(t.sequelize, { instanceId: inst.id, action: 'acknowledge', at: clock.now(), actor: { userId: null, name: 'Test', how: 'screen' } });
    await t.sequelize.query('UPDATE tanks SET offline = 1 WHERE id = ?', { replacements: [t.tanks.A5.id] });
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('suppressed');
    // While offline nothing new is raised or cleared.
    clock.advance(60_000);
    await engine.onReadings([reading(t, 'A5', clock.ms(), { ratio: 14 })]);
    expect((await instancesOf(t.sequelize, def))[0]).toMatchObject({ state: 'suppressed', condition_active: 1 });
    await t.sequelize.query('UPDATE tanks SET offline = 0 WHERE id = ?', { replacements: [t.tanks.A5.id] });
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    expect((await eventsOf(t.sequelize, def)).map((e) => `${e.kind}:${e.how}`)).toEqual(
      ['activated:automatic', 'acknowledged:screen', 'suppressed:automatic', 'unsuppressed:automatic']);
  });

  it('when a shelve expires while the condition is still active, then the tick unshelves and re-annunciates it', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.A6.id, 'ratio-below-band', { on_delay_s: 0 });
    const clock = testClock();
    const engine = t.engine(clock);
    await engine.onReadings([reading(t, 'A6', clock.ms(), { ratio: 5 })]);
    const [inst] = await instancesOf(t.sequelize, def);
    await applyAction(t.sequelize, { instanceId: inst.id, action: 'shelve', at: clock.now(), actor: { userId: null, name: 'Test', how: 'screen' }, reason: 'Pump under repair', shelvedUntil: new Date(clock.ms() + 30 * MIN) });
    clock.advance(29 * MIN);
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('shelved');
    clock.advance(2 * MIN);
    await engine.tick();
    const [after] = await instancesOf(t.sequelize, def);
    expect(after.state).toBe('unacknowledged');
    expect(new Date(after.unack_since!).getTime()).toBe(clock.ms());
    const last = (await eventsOf(t.sequelize, def)).at(-1)!;
    expect(last).toMatchObject({ kind: 'unshelved', how: 'automatic', comment: 'Shelve expired' });
  });

  it('when a probe sends nothing for longer than the stale limit, then the tick raises the stale alarm, and a new reading clears it', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B1.id, 'stale', { threshold: 12, on_delay_s: 0, off_delay_s: 0 });
    const clock = testClock();
    const engine = t.engine(clock);
    await engine.onReadings([{ ...reading(t, 'B1', clock.ms()), ratio: 1 }]);
    clock.advance(55_000);
    await engine.tick();
    expect(await instancesOf(t.sequelize, def)).toEqual([]);
    clock.advance(10_000);
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    await engine.onReadings([{ ...reading(t, 'B1', clock.ms()), ratio: 1 }]);
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('rtn-unacknowledged');
  });

  it('when an assay disagrees with the probe beyond the tolerance, then the calibration-drift hook raises the alarm at once', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B2.id, 'calibration-drift', { threshold: 10 });
    const engine = t.engine(testClock());
    await engine.raiseCalibrationDrift(t.tanks.B2.id, 4);
    expect(await instancesOf(t.sequelize, def)).toEqual([]);
    await engine.raiseCalibrationDrift(t.tanks.B2.id, -14.5);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    expect((await eventsOf(t.sequelize, def))[0].value).toBe(14.5);
  });

  it('when the probe check is past due, then the overdue alarm is raised, and recording a check clears it', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B3.id, 'probe-check-overdue');
    const clock = testClock();
    const engine = t.engine(clock);
    await t.sequelize.query('DELETE FROM alarm_inputs WHERE tank_id = ?', { replacements: [t.tanks.B3.id] });
    await recordProbeCheck(t.sequelize, t.tanks.B3.id, new Date(clock.ms() - 8 * 86_400_000));
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
    await recordProbeCheck(t.sequelize, t.tanks.B3.id, clock.now());
    await engine.tick();
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('rtn-unacknowledged');
  });

  it('when a probe reads a constant value for the flat-line window, then the flat-line alarm is raised', async () => {
    const def = await onlyDefinition(t.sequelize, t.tanks.B4.id, 'probe-flatline', { threshold: 0.5, window_s: 300, on_delay_s: 0 });
    const clock = testClock();
    const engine = t.engine(clock);
    const start = clock.ms();
    for (let s = 0; s <= 300; s += 5) await engine.onReadings([{ ...reading(t, 'B4', start + s * 1000), orpMv: 560, ratio: 1 }]);
    expect((await instancesOf(t.sequelize, def))[0].state).toBe('unacknowledged');
  });
});

describe('alarm engine queue', () => {
  it('when readings are pushed faster than they are evaluated, then they are merged in order and none is lost', async () => {
    const { queueAlarmReadings } = await import('../../api/src/modules/alarms/engine-queue.ts');
    const calls: number[][] = [];
    const engine = {
      onReadings: async (r: Array<{ probeId: number }>) => {
        calls.push(r.map((x) => x.probeId));
        await new Promise((ok) => setTimeout(ok, 20));
      },
      tick: async () => {},
      raiseCalibrationDrift: async () => {},
    };
    const q = queueAlarmReadings(engine as never, { warn: () => {} });
    for (let i = 1; i <= 5; i += 1) q.push([{ probeId: i } as never]);
    await q.drain();
    expect(calls).toEqual([[1], [2, 3, 4, 5]]);
  });
});
