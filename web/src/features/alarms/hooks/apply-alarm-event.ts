import type { ActiveAlarmsResponse, AlarmEventView } from '@shared/schemas/alarms';

/**
 * Folds one pushed event into the open-alarm list. Events may come twice or out of order
 * (replay after a reconnect races the live feed), so each alarm takes only events newer than
 * the last one it reflects. Returns the list (same object when nothing changed) and whether a
 * reload is needed: a new alarm needs its full record (rationalisation, values) from the server.
 */
export function applyAlarmEvent(list: ActiveAlarmsResponse, e: AlarmEventView): { list: ActiveAlarmsResponse; reload: boolean } {
  if (e.id <= list.lastEventId) return { list, reload: false };
  const i = list.alarms.findIndex((a) => a.id === e.instanceId);
  if (i < 0) return { list, reload: e.toState !== 'normal' };
  const alarm = list.alarms[i];
  if (e.id <= alarm.lastEventId) return { list, reload: false };
  if (e.toState === 'normal') return { list: { ...list, alarms: list.alarms.filter((_, k) => k !== i) }, reload: false };
  const next = {
    ...alarm,
    state: e.toState,
    conditionActive: e.conditionActive,
    lastEventId: e.id,
    ...(e.kind === 'acknowledged' ? { ackedAt: e.at, ackedBy: e.byName } : {}),
    ...(e.toState === 'unacknowledged' && alarm.state !== 'unacknowledged' && alarm.state !== 'rtn-unacknowledged' ? { unackSince: e.at } : {}),
  };
  // Shelve details (until, reason) are not in the event: fetch them.
  return { list: { ...list, alarms: list.alarms.map((a, k) => (k === i ? next : a)) }, reload: e.kind === 'shelved' };
}

/** A new high-priority alarm the room must notice: it just became unacknowledged while active. */
export function isP1Annunciation(e: AlarmEventView): boolean {
  return e.priority === 1 && e.toState === 'unacknowledged' && e.fromState !== 'unacknowledged' && e.fromState !== 'acknowledged';
}
