import { createContext, useContext, type ReactNode } from 'react';

/**
 * The worst open alarm per tank, for screens outside the Alarm desk (Floor tiles, Tank page).
 * The app shell fills it from the alarms feature, so those features need not import it.
 */
/** `unacknowledged` counts the alarms of the worst priority that wait for acknowledgement. */
export type TankAlarmBadge = { priority: 1 | 2 | 3; count: number; unacknowledged: number; label: string };

const TankAlarmsContext = createContext<ReadonlyMap<number, TankAlarmBadge>>(new Map());

export function TankAlarmsProvider({ value, children }: { value: ReadonlyMap<number, TankAlarmBadge>; children: ReactNode }) {
  return <TankAlarmsContext.Provider value={value}>{children}</TankAlarmsContext.Provider>;
}

export function useTankAlarm(tankId: number): TankAlarmBadge | undefined {
  return useContext(TankAlarmsContext).get(tankId);
}
