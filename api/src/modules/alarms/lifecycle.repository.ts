import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { AlarmHow, AlarmState } from '../../../../shared/alarms/states.ts';

/**
 * The write side of alarm_instances and alarm_events (lifecycle.ts decides what to write).
 * Every function but withAlarmLock runs inside the transaction withAlarmLock opened.
 */
export type LockedInstance = { id: number; definition_id: number; state: AlarmState; condition_active: number; open_definition_id: number | null; activated_at: Date | null };

export type NewEvent = {
  instanceId: number; at: Date; kind: string; fromState: AlarmState; toState: AlarmState; conditionActive: boolean;
  value: number | null; limit: number | null; userId: number | null; byName: string | null; how: AlarmHow; comment: string | null;
};

/**
 * Runs fn in a transaction holding the alarm write lock (the alarm_event_order row, see the
 * migration), so transitions are serialised and event ids commit in order.
 */
export function withAlarmLock<T>(sequelize: Sequelize, fn: (t: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction(async (t) => {
    await sequelize.query('SELECT id FROM alarm_event_order WHERE id = 1 FOR UPDATE', { type: QueryTypes.SELECT, transaction: t });
    return fn(t);
  });
}

export const lifecycleRepository = {
  /** An instance by its id, or the open instance of a definition, locked for the transaction. */
  async lockInstance(sequelize: Sequelize, t: Transaction, by: { instanceId: number } | { definitionId: number }): Promise<LockedInstance | undefined> {
    const [where, id] = 'instanceId' in by ? ['id', by.instanceId] : ['open_definition_id', by.definitionId];
    const [row] = await sequelize.query<LockedInstance>(
      `SELECT id, definition_id, state, condition_active, open_definition_id, activated_at FROM alarm_instances WHERE ${where} = ? FOR UPDATE`,
      { replacements: [id], type: QueryTypes.SELECT, transaction: t });
    return row;
  },

  /** Opens a new instance of a definition in state normal; null when the definition does not exist. */
  async openInstance(sequelize: Sequelize, t: Transaction, definitionId: number, at: Date): Promise<number | null> {
    const [newId, inserted] = await sequelize.query(
      `INSERT INTO alarm_instances (definition_id, tank_id, priority, state, condition_active, open_definition_id, opened_at)
       SELECT id, tank_id, priority, 'normal', 0, id, ? FROM alarm_definitions WHERE id = ?`,
      { replacements: [at, definitionId], type: QueryTypes.INSERT, transaction: t });
    return inserted ? Number(newId) : null;
  },

  async insertEvent(sequelize: Sequelize, t: Transaction, e: NewEvent): Promise<number> {
    const [eventId] = await sequelize.query(
      `INSERT INTO alarm_events (instance_id, definition_id, tank_id, at, kind, from_state, to_state, condition_active, value, limit_value, by_user_id, by_name, how, comment)
       SELECT ?, definition_id, tank_id, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ? FROM alarm_instances WHERE id = ?`,
      { replacements: [e.instanceId, e.at, e.kind, e.fromState, e.toState, e.conditionActive, e.value, e.limit,
        e.userId, e.byName, e.how, e.comment, e.instanceId], type: QueryTypes.INSERT, transaction: t });
    return Number(eventId);
  },

  /** Sets the given alarm_instances columns and the instance's last event. */
  async updateInstance(sequelize: Sequelize, t: Transaction, instanceId: number, set: Record<string, unknown>, lastEventId: number): Promise<void> {
    const keys = Object.keys(set);
    await sequelize.query(`UPDATE alarm_instances SET ${keys.map((k) => `${k} = ?`).join(', ')}, last_event_id = ? WHERE id = ?`,
      { replacements: [...keys.map((k) => set[k]), lastEventId, instanceId], transaction: t });
  },

  /** A history entry that is not a transition (escalation mail queued): state unchanged. */
  async appendNote(sequelize: Sequelize, t: Transaction, instanceId: number, kind: 'escalated', comment: string, at: Date): Promise<number> {
    const [eventId] = await sequelize.query(
      `INSERT INTO alarm_events (instance_id, definition_id, tank_id, at, kind, from_state, to_state, condition_active, how, comment)
       SELECT id, definition_id, tank_id, ?, ?, state, state, condition_active, 'automatic', ? FROM alarm_instances WHERE id = ?`,
      { replacements: [at, kind, comment, instanceId], type: QueryTypes.INSERT, transaction: t });
    await sequelize.query('UPDATE alarm_instances SET last_event_id = ? WHERE id = ?', { replacements: [eventId, instanceId], transaction: t });
    return Number(eventId);
  },
};
