import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ShiftInput, OnCallShiftView } from '@shared/schemas/roster';
import { api } from '../../../lib/api-client';
import { rosterKeys } from './roster-keys';

export const createShift = (input: ShiftInput) => api.post<{ shift: OnCallShiftView }>('/api/roster/shifts', input).then((r) => r.shift);

export function useCreateShift() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createShift, onSuccess: () => qc.invalidateQueries({ queryKey: rosterKeys.all }) });
}
