import type { ShelveInput } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const shelveAlarm = ({ id, input }: { id: number; input: ShelveInput }) => api.post<ActionResult>(`/api/alarms/instances/${id}/shelve`, input);

export const useShelveAlarm = () => useAlarmMutation(shelveAlarm);
