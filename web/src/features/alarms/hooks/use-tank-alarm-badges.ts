import { useMemo } from 'react';
import type { AlarmView } from '@shared/schemas/alarms';
import type { TankAlarmBadge, TankAlarms, TankHeldAlarms } from '../../../lib/tank-alarms';
import { useActiveAlarms } from '../api/get-active-alarms';
import { isAnnunciated, isUnacknowledged } from '../components/alarm-states';

/**
 * Worst annunciated alarm per tank (shelved, suppressed and out-of-service ones are not
 * annunciated); `unacknowledged` counts those of that worst priority, which is what the pill shows.
 */
export function tankBadges(alarms: readonly AlarmView[]): Map<number, TankAlarmBadge> {
  const out = new Map<number, TankAlarmBadge>();
  for (const a of alarms) {
    if (!isAnnunciated(a.state) || a.tankId === null) continue;
    const unack = isUnacknowledged(a.state) ? 1 : 0;
    const b = out.get(a.tankId);
    if (!b || a.priority < b.priority) out.set(a.tankId, { priority: a.priority, count: (b?.count ?? 0) + 1, unacknowledged: unack, label: a.label });
    else out.set(a.tankId, { ...b, count: b.count + 1, unacknowledged: b.unacknowledged + (a.priority === b.priority ? unack : 0) });
  }
  return out;
}

/** Per tank, how many open alarms are not annunciated (shelved, suppressed, out of service). */
export function tankSilenced(alarms: readonly AlarmView[]): Map<number, number> {
  const out = new Map<number, number>();
  for (const a of alarms) if (!isAnnunciated(a.state) && a.tankId !== null) out.set(a.tankId, (out.get(a.tankId) ?? 0) + 1);
  return out;
}

/** Per tank, its shelved, out-of-service and suppressed alarms, for the marks on tiles. */
export function tankHeld(alarms: readonly AlarmView[]): Map<number, TankHeldAlarms> {
  const out = new Map<number, TankHeldAlarms>();
  for (const a of alarms) {
    if (isAnnunciated(a.state) || a.state === 'normal' || a.tankId === null) continue;
    const h = out.get(a.tankId) ?? { shelved: 0, outOfService: 0, suppressed: 0, shelvedUntil: null };
    if (a.state === 'shelved') {
      h.shelved += 1;
      if (a.shelvedUntil && (!h.shelvedUntil || a.shelvedUntil < h.shelvedUntil)) h.shelvedUntil = a.shelvedUntil;
    } else if (a.state === 'out-of-service') h.outOfService += 1;
    else h.suppressed += 1;
    out.set(a.tankId, h);
  }
  return out;
}

export function useTankAlarmBadges(): TankAlarms {
  const alarms = useActiveAlarms().data?.alarms;
  return useMemo(() => ({ badges: tankBadges(alarms ?? []), silenced: tankSilenced(alarms ?? []), held: tankHeld(alarms ?? []) }), [alarms]);
}
