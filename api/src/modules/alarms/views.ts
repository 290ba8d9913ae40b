import { KIND_INFO, type AlarmKind, type Priority } from '../../../../shared/alarms/kinds.ts';
import type { AlarmHow, AlarmState } from '../../../../shared/alarms/states.ts';
import type { AlarmEventView, AlarmView } from '../../../../shared/schemas/alarms.ts';

/** Row shapes of the alarm SELECTs (alarms.repository.ts) and their mapping to the API views. */
const iso = (d: Date | string | null): string | null => (d === null ? null : new Date(d).toISOString());

export type InstanceRow = {
  id: number; definition_id: number; tank_id: number | null; priority: Priority; state: AlarmState; condition_active: number;
  opened_at: Date; activated_at: Date | null; unack_since: Date | null; acked_at: Date | null; acked_by: string | null;
  closed_at: Date | null; shelved_until: Date | null; shelved_reason: string | null; shelved_by: string | null; oos_reason: string | null; oos_until: Date | null;
  first_value: number | null; limit_value: number | null; last_value: number | null; last_value_at: Date | null; last_event_id: number;
  kind: AlarmKind; cause: string; consequence: string; action: string; response_min: number;
  tank_tag: string | null; tank_name: string | null; circuit_id: number | null; circuit_tag: string | null; site_tag: string | null;
};

export function toAlarmView(r: InstanceRow): AlarmView {
  return {
    id: r.id, definitionId: r.definition_id, kind: r.kind, label: KIND_INFO[r.kind].label, priority: r.priority, unit: KIND_INFO[r.kind].unit,
    tankId: r.tank_id, tankTag: r.tank_tag, tankName: r.tank_name, circuitId: r.circuit_id, circuitTag: r.circuit_tag, siteTag: r.site_tag,
    state: r.state, conditionActive: r.condition_active === 1,
    openedAt: iso(r.opened_at)!, activatedAt: iso(r.activated_at), unackSince: iso(r.unack_since), closedAt: iso(r.closed_at),
    ackedAt: iso(r.acked_at), ackedBy: r.acked_by,
    shelvedUntil: iso(r.shelved_until), shelvedReason: r.shelved_reason, shelvedBy: r.shelved_by, oosReason: r.oos_reason, oosUntil: iso(r.oos_until),
    firstValue: r.first_value, limitValue: r.limit_value, lastValue: r.last_value, lastValueAt: iso(r.last_value_at),
    rationalisation: { cause: r.cause, consequence: r.consequence, action: r.action, responseMin: r.response_min },
    lastEventId: r.last_event_id,
  };
}

export type EventRow = {
  id: number; instance_id: number; definition_id: number; tank_id: number | null; at: Date; kind: string; from_state: AlarmState;
  to_state: AlarmState; condition_active: number; value: number | null; limit_value: number | null; by_user_id: number | null;
  by_name: string | null; how: AlarmHow; comment: string | null; alarm_kind: AlarmKind; priority: Priority; tank_tag: string | null; site_tag: string | null;
};

export function toEventView(r: EventRow): AlarmEventView {
  return {
    id: r.id, instanceId: r.instance_id, definitionId: r.definition_id, tankId: r.tank_id, tankTag: r.tank_tag, siteTag: r.site_tag,
    alarmKind: r.alarm_kind, priority: r.priority, kind: r.kind, fromState: r.from_state, toState: r.to_state,
    conditionActive: r.condition_active === 1, at: iso(r.at)!, byUserId: r.by_user_id, byName: r.by_name, how: r.how,
    comment: r.comment, value: r.value, limit: r.limit_value,
  };
}
