import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const acknowledgeAlarm = ({ id, comment }: { id: number; comment?: string }) =>
  api.post<ActionResult>(`/api/alarms/instances/${id}/acknowledge`, { comment });

export const useAcknowledgeAlarm = () => useAlarmMutation(acknowledgeAlarm);
