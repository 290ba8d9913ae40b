import type { OosInput } from '@shared/schemas/alarms';
import { api } from '../../../lib/api-client';
import { useAlarmMutation, type ActionResult } from './alarm-mutation';

export const removeFromService = ({ definitionId, input }: { definitionId: number; input: OosInput }) =>
  api.post<ActionResult>(`/api/alarms/definitions/${definitionId}/out-of-service`, input);

export const useRemoveFromService = () => useAlarmMutation(removeFromService);
