import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiRequest } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const removeShift = ({ id, reason }: { id: number; reason: string }) => apiRequest<void>(`/api/roster/shifts/${id}`, { method: 'DELETE', body: { reason } });

export function useRemoveShift() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: removeShift, onSuccess: () => qc.invalidateQueries({ queryKey: rosterKeys.all }) });
}
