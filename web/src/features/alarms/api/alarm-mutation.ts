import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AlarmView } from '@shared/schemas/alarms';
import { alarmKeys } from './alarm-keys';

/** What a lifecycle action answers: the alarm after it and the event it wrote. */
export type ActionResult = { alarm: AlarmView; eventId: number };

/** Every lifecycle action has the same effect on the cache: refresh the open list and the open timelines. */
export function useAlarmMutation<I, O>(fn: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: alarmKeys.active() }), qc.invalidateQueries({ queryKey: alarmKeys.details() })]),
  });
}
