import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const removeFromService = ({ definitionId, reason }: { definitionId: number; reason: string }) =>
  api.post<ActionResult>(`/api/alarms/definitions/${definitionId}/out-of-service`, { reason });

export const useRemoveFromService = () => useAlarmMutation(removeFromService);
