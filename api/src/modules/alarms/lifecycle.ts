import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { EVENT_KIND, UNACKNOWLEDGED, transition, type AlarmAction, type AlarmHow, type AlarmState, type AlarmStatus } from '../../../../shared/alarms/states.ts';

/**
 * Applies lifecycle actions to the database: the one writer of alarm_instances and
 * alarm_events, used by the engine, the Alarm desk routes and the e-mail acknowledge links.
 * Every call runs under the alarm_event_order row lock (see the migration), so transitions are
 * serialised, event ids commit in order, and two processes can never open two instances.
 */
export type Actor = { userId: number | null; name: string | null; how: AlarmHow };

export type ApplyInput = {
  action: AlarmAction;
  at: Date;
  actor: Actor;
  /** Acts on this definition's open instance (or opens one). */
  definitionId?: number;
  /** Acts on this instance; it must still be open unless the action is a comment. */
  instanceId?: number;
  comment?: string | null;
  reason?: string | null;
  value?: number | null;
  limit?: number | null;
  shelvedUntil?: Date | null;
};

export type ApplyResult =
  | { ok: true; eventId: number; instanceId: number; from: AlarmStatus; to: AlarmStatus }
  | { ok: false; reason: string; notFound?: boolean; instanceId: number | null; status: AlarmStatus };

type InstanceRow = { id: number; definition_id: number; state: AlarmState; condition_active: number; open_definition_id: number | null; activated_at: Date | null };

const NORMAL: AlarmStatus = { state: 'normal', conditionActive: false };

/** Runs fn in a transaction holding the alarm write lock. */
export function withAlarmLock<T>(sequelize: Sequelize, fn: (t: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction(async (t) => {
    await sequelize.query('SELECT id FROM alarm_event_order WHERE id = 1 FOR UPDATE', { type: QueryTypes.SELECT, transaction: t });
    return fn(t);
  });
}

export function applyAction(sequelize: Sequelize, input: ApplyInput): Promise<ApplyResult> {
  return withAlarmLock(sequelize, (t) => applyInTransaction(sequelize, t, input));
}

/** The body of applyAction, for callers that need more in the same transaction (ack links). */
export async function applyInTransaction(sequelize: Sequelize, t: Transaction, input: ApplyInput): Promise<ApplyResult> {
  const select = (where: string, id: number) => sequelize.query<InstanceRow>(
    `SELECT id, definition_id, state, condition_active, open_definition_id, activated_at FROM alarm_instances WHERE ${where} = ? FOR UPDATE`,
    { replacements: [id], type: QueryTypes.SELECT, transaction: t });
  const [row] = input.instanceId !== undefined ? await select('id', input.instanceId) : await select('open_definition_id', input.definitionId!);
  if (input.instanceId !== undefined && !row) return { ok: false, reason: 'No such alarm', notFound: true, instanceId: null, status: NORMAL };
  const open = !!row && row.open_definition_id !== null;
  const from: AlarmStatus = open ? { state: row.state, conditionActive: row.condition_active === 1 } : NORMAL;
  if (input.instanceId !== undefined && !open && input.action !== 'comment') {
    return { ok: false, reason: 'This alarm has already returned to normal', instanceId: row!.id, status: from };
  }
  const result = transition(from, input.action);
  if (!result.ok) return { ok: false, reason: result.reason, instanceId: row?.id ?? null, status: from };
  const to = result.to;

  let instanceId = row?.id;
  const definitionId = row?.definition_id ?? input.definitionId!;
  if (!open && input.action !== 'comment') {
    const [newId, inserted] = await sequelize.query(
      `INSERT INTO alarm_instances (definition_id, tank_id, priority, state, condition_active, open_definition_id, opened_at)
       SELECT id, tank_id, priority, 'normal', 0, id, ? FROM alarm_definitions WHERE id = ?`,
      { replacements: [input.at, definitionId], type: QueryTypes.INSERT, transaction: t });
    if (!inserted) return { ok: false, reason: 'No such alarm definition', notFound: true, instanceId: null, status: NORMAL };
    instanceId = Number(newId);
  }

  const [eventId] = await sequelize.query(
    `INSERT INTO alarm_events (instance_id, definition_id, tank_id, at, kind, from_state, to_state, condition_active, value, limit_value, by_user_id, by_name, how, comment)
     SELECT ?, definition_id, tank_id, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ? FROM alarm_instances WHERE id = ?`,
    { replacements: [instanceId, input.at, EVENT_KIND[input.action], from.state, to.state, to.conditionActive, input.value ?? null, input.limit ?? null,
      input.actor.userId, input.actor.name, input.actor.how, (input.comment || input.reason) ?? null, instanceId], type: QueryTypes.INSERT, transaction: t });

  const { sql, values } = instanceUpdate(input, from, to, row?.activated_at ?? null);
  await sequelize.query(`UPDATE alarm_instances SET ${sql}, last_event_id = ? WHERE id = ?`,
    { replacements: [...values, eventId, instanceId], transaction: t });
  return { ok: true, eventId: Number(eventId), instanceId: instanceId!, from, to };
}

/** Column changes for one transition (the instance row is a summary; the events are the record). */
function instanceUpdate(input: ApplyInput, from: AlarmStatus, to: AlarmStatus, activatedAt: Date | null): { sql: string; values: unknown[] } {
  const set: Record<string, unknown> = { state: to.state, condition_active: to.conditionActive };
  if (input.value != null) Object.assign(set, { last_value: input.value, last_value_at: input.at });
  const wasUnack = UNACKNOWLEDGED.includes(from.state);
  const isUnack = UNACKNOWLEDGED.includes(to.state);
  if (isUnack && !wasUnack) set.unack_since = input.at;
  if (!isUnack) set.unack_since = null;
  if (to.state === 'unacknowledged' && !activatedAt) set.activated_at = input.at;
  if (input.action === 'activate' && !activatedAt) Object.assign(set, { first_value: input.value ?? null, limit_value: input.limit ?? null });
  if (input.action === 'acknowledge') Object.assign(set, { acked_at: input.at, acked_by: input.actor.name });
  if (input.action === 'shelve') Object.assign(set, { shelved_until: input.shelvedUntil ?? null, shelved_reason: input.reason ?? null, shelved_by: input.actor.name });
  if (input.action === 'unshelve') set.shelved_until = null;
  if (input.action === 'remove-from-service') set.oos_reason = input.reason ?? null;
  if (input.action === 'return-to-service') set.oos_reason = null;
  if (to.state === 'normal' && input.action !== 'comment') Object.assign(set, { open_definition_id: null, closed_at: input.at });
  const keys = Object.keys(set);
  return { sql: keys.map((k) => `${k} = ?`).join(', '), values: keys.map((k) => set[k]) };
}

/** A history entry that is not a transition (escalation mail queued): state unchanged, under the lock. */
export async function appendNote(sequelize: Sequelize, t: Transaction, instanceId: number, kind: 'escalated', comment: string, at: Date): Promise<number> {
  const [eventId] = await sequelize.query(
    `INSERT INTO alarm_events (instance_id, definition_id, tank_id, at, kind, from_state, to_state, condition_active, how, comment)
     SELECT id, definition_id, tank_id, ?, ?, state, state, condition_active, 'automatic', ? FROM alarm_instances WHERE id = ?`,
    { replacements: [at, kind, comment, instanceId], type: QueryTypes.INSERT, transaction: t });
  await sequelize.query('UPDATE alarm_instances SET last_event_id = ? WHERE id = ?', { replacements: [eventId, instanceId], transaction: t });
  return Number(eventId);
}
