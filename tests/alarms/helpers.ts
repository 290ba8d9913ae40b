/** Shared arrangements for the alarm tests: a clock the test moves, readings for a demo tank, one definition per tank. */
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes, type Sequelize } from 'sequelize';
import { createApp } from '../../api/src/app.ts';
import { createAlarmEngine } from '../../api/src/modules/alarms/engine.ts';
import { definitionsRepository } from '../../api/src/modules/alarms/definitions.repository.ts';
import type { AlarmKind } from '../../shared/alarms/kinds.ts';
import { CIRCUIT_TEMPLATES } from '../../shared/alarms/templates.ts';
import type { TankLive } from '../../shared/schemas/readings.ts';
import { createTestApi, TEST_SECRET, type TestApi } from '../helpers/api.ts';

export type Clock = { now: () => Date; ms: () => number; advance(ms: number): void; set(ms: number): void };

/** A clock that only moves when the test says so. */
export function testClock(startMs = Date.parse('2026-12-01T08:00:00.000Z')): Clock {
  let t = startMs;
  return { now: () => new Date(t), ms: () => t, advance: (ms) => void (t += ms), set: (ms) => void (t = ms) };
}

export type AlarmTestApi = TestApi & {
  mailDir: string;
  tanks: Record<string, { id: number; probeId: number }>;
  engine(clock: Clock): ReturnType<typeof createAlarmEngine>;
};

/** The demo plant with an app that signs acknowledge links with TEST_SECRET and reads caught mail from a temp folder. */
export async function createAlarmTestApi(): Promise<AlarmTestApi> {
  const t = await createTestApi();
  const mailDir = mkdtempSync(path.join(os.tmpdir(), 'fs-mail-'));
  const app = createApp({ auth: t.auth, ttlS: 3600, ackSecret: TEST_SECRET, mailDir });
  const rows = await t.sequelize.query<{ tag: string; id: number; probe_id: number }>(
    'SELECT t.tag, t.id, p.id AS probe_id FROM tanks t JOIN probes p ON p.tank_id = t.id', { type: QueryTypes.SELECT });
  const tanks = Object.fromEntries(rows.map((r) => [r.tag, { id: r.id, probeId: r.probe_id }]));
  return {
    ...t, app, mailDir, tanks,
    engine: (clock) => createAlarmEngine({ sequelize: t.sequelize, now: clock.now }),
    async close() {
      rmSync(mailDir, { recursive: true, force: true });
      await t.close();
    },
  };
}

/** A normal reading of a Train A tank (band 8–25), with overrides. */
export function reading(t: AlarmTestApi, tankTag: string, tsMs: number, over: Partial<TankLive> = {}): TankLive {
  const tank = t.tanks[tankTag];
  return {
    tankId: tank.id, probeId: tank.probeId, probeTag: `${tankTag}-ORP`, ts: new Date(tsMs).toISOString(),
    orpMv: 575 + Math.sin(tsMs / 7000), tempC: 42, ehV: 0.78, ratio: 14, ferricFraction: 14 / 15, flag: 'ok', calibrationVersion: 1, ...over,
  };
}

/** Removes the seeded timer-driven definitions, so a test's tick only touches what the test set up. */
export async function withoutTimerDefinitions(sequelize: Sequelize): Promise<void> {
  await sequelize.query("DELETE FROM alarm_definitions WHERE kind IN ('stale', 'probe-check-overdue', 'calibration-drift') AND id NOT IN (SELECT definition_id FROM alarm_instances)");
}

/** Leaves one definition of this kind on the tank (others deleted, so nothing else fires) with the given settings. */
export async function onlyDefinition(sequelize: Sequelize, tankId: number, kind: AlarmKind, set: Record<string, unknown> = {}): Promise<number> {
  await sequelize.query('DELETE FROM alarm_definitions WHERE tank_id = ? AND kind <> ? AND id NOT IN (SELECT definition_id FROM alarm_instances)', { replacements: [tankId, kind] });
  let [row] = await sequelize.query<{ id: number }>('SELECT id FROM alarm_definitions WHERE tank_id = ? AND kind = ?', { replacements: [tankId, kind], type: QueryTypes.SELECT });
  if (!row) {
    const template = CIRCUIT_TEMPLATES[0].definitions.find((d) => d.kind === kind)!;
    row = { id: (await definitionsRepository.insert(sequelize, tankId, template, new Date()))! };
  }
  const keys = Object.keys(set);
  if (keys.length) await sequelize.query(`UPDATE alarm_definitions SET ${keys.map((k) => `${k} = ?`).join(', ')} WHERE id = ?`, { replacements: [...Object.values(set), row.id] });
  return row.id;
}

export type InstanceState = { id: number; state: string; condition_active: number; open_definition_id: number | null; unack_since: Date | null };

export async function instancesOf(sequelize: Sequelize, definitionId: number): Promise<InstanceState[]> {
  return sequelize.query<InstanceState>('SELECT id, state, condition_active, open_definition_id, unack_since FROM alarm_instances WHERE definition_id = ? ORDER BY id',
    { replacements: [definitionId], type: QueryTypes.SELECT });
}

export type EventRow = { id: number; instance_id: number; kind: string; from_state: string; to_state: string; how: string; by_name: string | null; by_user_id: number | null; comment: string | null; value: number | null };

export async function eventsOf(sequelize: Sequelize, definitionId: number): Promise<EventRow[]> {
  return sequelize.query<EventRow>('SELECT id, instance_id, kind, from_state, to_state, how, by_name, by_user_id, comment, value FROM alarm_events WHERE definition_id = ? ORDER BY id',
    { replacements: [definitionId], type: QueryTypes.SELECT });
}

export const MIN = 60_000;
