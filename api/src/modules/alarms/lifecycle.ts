import type { Sequelize, Transaction } from 'sequelize';
import { EVENT_KIND, UNACKNOWLEDGED, transition, type AlarmAction, type AlarmHow, type AlarmStatus } from '../../../../shared/alarms/states.ts';
import { lifecycleRepository as repo, withAlarmLock } from './lifecycle.repository.ts';

/**
 * Applies lifecycle actions for the engine, the Alarm desk routes and the e-mail acknowledge
 * links: decides each transition, and lifecycle.repository.ts (the one writer of
 * alarm_instances and alarm_events) records it.
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
  /** When an out-of-service period ends on its own. */
  oosUntil?: Date | null;
};

export type ApplyResult =
  | { ok: true; eventId: number; instanceId: number; from: AlarmStatus; to: AlarmStatus }
  | { ok: false; reason: string; notFound?: boolean; instanceId: number | null; status: AlarmStatus };

const NORMAL: AlarmStatus = { state: 'normal', conditionActive: false };

export function applyAction(sequelize: Sequelize, input: ApplyInput): Promise<ApplyResult> {
  return withAlarmLock(sequelize, (t) => applyInTransaction(sequelize, t, input));
}

/** The body of applyAction, for callers that need more in the same transaction (ack links). */
export async function applyInTransaction(sequelize: Sequelize, t: Transaction, input: ApplyInput): Promise<ApplyResult> {
  const row = await repo.lockInstance(sequelize, t, input.instanceId !== undefined ? { instanceId: input.instanceId } : { definitionId: input.definitionId! });
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
    const newId = await repo.openInstance(sequelize, t, definitionId, input.at);
    if (newId === null) return { ok: false, reason: 'No such alarm definition', notFound: true, instanceId: null, status: NORMAL };
    instanceId = newId;
  }

  const eventId = await repo.insertEvent(sequelize, t, {
    instanceId: instanceId!, at: input.at, kind: EVENT_KIND[input.action], fromState: from.state, toState: to.state, conditionActive: to.conditionActive,
    value: input.value ?? null, limit: input.limit ?? null, userId: input.actor.userId, byName: input.actor.name, how: input.actor.how,
    comment: (input.comment || input.reason) ?? null,
  });
  await repo.updateInstance(sequelize, t, instanceId!, instanceUpdate(input, from, to, row?.activated_at ?? null), eventId);
  return { ok: true, eventId, instanceId: instanceId!, from, to };
}

/** Column changes for one transition (the instance row is a summary; the events are the record). */
function instanceUpdate(input: ApplyInput, from: AlarmStatus, to: AlarmStatus, activatedAt: Date | null): Record<string, unknown> {
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
  if (input.action === 'remove-from-service') Object.assign(set, { oos_reason: input.reason ?? null, oos_until: input.oosUntil ?? null });
  if (input.action === 'return-to-service') Object.assign(set, { oos_reason: null, oos_until: null });
  if (to.state === 'normal' && input.action !== 'comment') Object.assign(set, { open_definition_id: null, closed_at: input.at });
  return set;
}
