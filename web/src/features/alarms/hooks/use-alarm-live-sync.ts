import { useQueryClient } from '@tanstack/react-query';
import { useEffect, useRef } from 'react';
import type { ActiveAlarmsResponse } from '@shared/schemas/alarms';
import { noteAlarmEventId, requestAlarmsSince, useSocketEvent } from '../../../lib/socket';
import { alarmKeys } from '../api/alarm-keys';
import { useActiveAlarms } from '../api/get-active-alarms';
import { applyAlarmEvent } from './apply-alarm-event';

const RELOAD_DEBOUNCE_MS = 300;

/**
 * Keeps the alarm caches live from the socket. Mounted once by the app shell. After the list
 * loads, asks the server for every event since the list's snapshot, so nothing that happened
 * between the HTTP answer and the socket is lost; reconnects resume from the newest id seen.
 */
export function useAlarmLiveSync(): void {
  const qc = useQueryClient();
  const active = useActiveAlarms();
  const snapshot = active.data?.lastEventId;
  const reloadTimer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);

  useEffect(() => {
    if (snapshot !== undefined) requestAlarmsSince(snapshot);
  }, [snapshot]);
  useEffect(() => () => clearTimeout(reloadTimer.current), []);

  const reloadSoon = () => {
    clearTimeout(reloadTimer.current);
    reloadTimer.current = setTimeout(() => void qc.invalidateQueries({ queryKey: alarmKeys.active() }), RELOAD_DEBOUNCE_MS);
  };

  useSocketEvent('alarm:event', (e) => {
    noteAlarmEventId(e.id);
    let reload = false;
    qc.setQueryData<ActiveAlarmsResponse>(alarmKeys.active(), (old) => {
      if (!old) return old;
      const r = applyAlarmEvent(old, e);
      reload = r.reload;
      return r.list;
    });
    if (reload) reloadSoon();
    // Only a timeline someone is looking at is refetched.
    void qc.invalidateQueries({ queryKey: alarmKeys.detail(e.instanceId) });
  });
  useSocketEvent('alarm:resync', () => void qc.invalidateQueries({ queryKey: alarmKeys.all }));
}
