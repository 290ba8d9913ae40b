import { QueryTypes, type Sequelize } from 'sequelize';
import type { PlantAlarmKind } from '../../../../shared/alarms/kinds.ts';
import type { AlarmState } from '../../../../shared/alarms/states.ts';

/**
 * Plant-wide alarms' definitions and the ingest workers' heartbeats. Every time is the database
 * clock's (NOW(3)), so the worker's and the notifier's own clocks never decide an age.
 */
/** stopped: the worker stopped on purpose (a clean stop) and is not watched until it beats again. */
export type WorkerBeat = { worker: string; beatAgeMs: number; upMs: number; stopped: boolean };
export type PlantAlarmState = { definitionId: number; instanceId: number | null; state: AlarmState | null; conditionActive: boolean };

export const systemAlarmsRepository = {
  /**
   * The worker is alive and can take readings. `first`: its first beat since it started, which
   * starts its up time afresh (a restarted worker must run a while before it counts as back).
   */
  async beat(sequelize: Sequelize, worker: string, first: boolean): Promise<void> {
    await sequelize.query(
      `INSERT INTO ingest_heartbeats (worker, started_at, beat_at) VALUES (?, NOW(3), NOW(3))
       ON DUPLICATE KEY UPDATE started_at = IF(?, NOW(3), started_at), beat_at = NOW(3), stopped_at = NULL`,
      { replacements: [worker, first] });
  },

  /** A worker stopped on purpose is no longer watched (the row stays: a worker was seen, so none beating later is news). */
  async stopped(sequelize: Sequelize, worker: string): Promise<void> {
    await sequelize.query('UPDATE ingest_heartbeats SET stopped_at = NOW(3) WHERE worker = ?', { replacements: [worker] });
  },

  async beats(sequelize: Sequelize): Promise<WorkerBeat[]> {
    const rows = await sequelize.query<{ worker: string; beat_age_ms: number; up_ms: number; stopped: number }>(
      `SELECT worker, stopped_at IS NOT NULL AS stopped, TIMESTAMPDIFF(MICROSECOND, beat_at, NOW(3)) DIV 1000 AS beat_age_ms,
              TIMESTAMPDIFF(MICROSECOND, started_at, NOW(3)) DIV 1000 AS up_ms
         FROM ingest_heartbeats ORDER BY worker`, { type: QueryTypes.SELECT });
    return rows.map((r) => ({ worker: r.worker, beatAgeMs: Number(r.beat_age_ms), upMs: Number(r.up_ms), stopped: Number(r.stopped) === 1 }));
  },

  /** The plant-wide definition of a kind (made by a migration), its open instance if any, and whether its condition is active now. */
  async plantAlarm(sequelize: Sequelize, kind: PlantAlarmKind): Promise<PlantAlarmState | null> {
    const [row] = await sequelize.query<{ id: number; instance_id: number | null; state: AlarmState | null; condition_active: number | null }>(
      `SELECT d.id, i.id AS instance_id, i.state, i.condition_active FROM alarm_definitions d LEFT JOIN alarm_instances i ON i.open_definition_id = d.id
        WHERE d.plant_kind = ?`, { replacements: [kind], type: QueryTypes.SELECT });
    return row ? { definitionId: row.id, instanceId: row.instance_id, state: row.state, conditionActive: row.condition_active === 1 } : null;
  },
};
