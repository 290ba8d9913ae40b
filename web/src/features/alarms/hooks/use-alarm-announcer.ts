import { useRef, useState } from 'react';
import type { AlarmEventView } from '@shared/schemas/alarms';
import { serverNow } from '../../../lib/clock';
import { useSocketEvent } from '../../../lib/socket';
import { isP1Annunciation } from './apply-alarm-event';
import { playAlarmTone } from './use-alarm-sound';

/** Older annunciations replayed after a reconnect are shown but do not sound. */
const SOUND_WITHIN_MS = 10 * 60_000;

/** New P1 alarms since the page opened, newest first; each sounds once (unless muted) and stays until dismissed. */
export function useAlarmAnnouncer() {
  const [fresh, setFresh] = useState<AlarmEventView[]>([]);
  const announced = useRef(new Set<number>());
  useSocketEvent('alarm:event', (e) => {
    if (!isP1Annunciation(e) || announced.current.has(e.id)) return;
    announced.current.add(e.id);
    if (serverNow() - Date.parse(e.at) < SOUND_WITHIN_MS) playAlarmTone();
    setFresh((list) => [e, ...list.filter((x) => x.instanceId !== e.instanceId)].slice(0, 5));
  });
  const dismiss = (instanceId: number) => setFresh((list) => list.filter((x) => x.instanceId !== instanceId));
  return { fresh, dismiss };
}
