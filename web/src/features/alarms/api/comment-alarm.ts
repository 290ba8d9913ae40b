import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const commentAlarm = ({ id, text }: { id: number; text: string }) => api.post<ActionResult>(`/api/alarms/instances/${id}/comment`, { text });

export const useCommentAlarm = () => useAlarmMutation(commentAlarm);
