import { createContext, useContext, type ReactNode } from 'react';

/**
 * The worst open alarm per tank, for screens outside the Alarm desk (Floor tiles, Tank page).
 * The app shell fills it from the alarms feature, so those features need not import it.
 */
/** `unacknowledged` counts the alarms of the worst priority that wait for acknowledgement. */
export type TankAlarmBadge = { priority: 1 | 2 | 3; count: number; unacknowledged: number; label: string };

/** Open alarms of a tank that do not sound now, by why; `shelvedUntil` is the earliest shelve end. */
export type TankHeldAlarms = { shelved: number; outOfService: number; suppressed: number; shelvedUntil: string | null };

/** `badges`: worst annunciated alarm per tank; `silenced`: how many of a tank's open alarms are shelved, suppressed or out of service; `held`: the same by kind. */
export type TankAlarms = { badges: ReadonlyMap<number, TankAlarmBadge>; silenced: ReadonlyMap<number, number>; held: ReadonlyMap<number, TankHeldAlarms> };

const TankAlarmsContext = createContext<TankAlarms>({ badges: new Map(), silenced: new Map(), held: new Map() });

export function TankAlarmsProvider({ value, children }: { value: TankAlarms; children: ReactNode }) {
  return <TankAlarmsContext.Provider value={value}>{children}</TankAlarmsContext.Provider>;
}

export function useTankAlarm(tankId: number): TankAlarmBadge | undefined {
  return useContext(TankAlarmsContext).badges.get(tankId);
}

export function useTankAlarms(): TankAlarms {
  return useContext(TankAlarmsContext);
}

export function useTankHeldAlarms(tankId: number): TankHeldAlarms | undefined {
  return useContext(TankAlarmsContext).held.get(tankId);
}

/** Open alarms of the tank that do not sound now (shelved, suppressed, out of service). */
export function useTankSilencedAlarms(tankId: number): number {
  return useContext(TankAlarmsContext).silenced.get(tankId) ?? 0;
}
