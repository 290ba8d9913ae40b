import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const unshelveAlarm = ({ id }: { id: number }) => api.post<ActionResult>(`/api/alarms/instances/${id}/unshelve`, {});

export const useUnshelveAlarm = () => useAlarmMutation(unshelveAlarm);
