import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const returnToService = ({ definitionId, comment }: { definitionId: number; comment: string }) =>
  api.post<ActionResult>(`/api/alarms/definitions/${definitionId}/return-to-service`, { comment });

export const useReturnToService = () => useAlarmMutation(returnToService);
