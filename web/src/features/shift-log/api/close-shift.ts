import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CloseShiftInput, ShiftView } from '@shared/schemas/shifts';
import { api } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

export async function closeShift(input: CloseShiftInput): Promise<ShiftView> {
  return (await api.post<{ shift: ShiftView }>('/api/shifts/close', input)).shift;
}

/** Hands the shift over; the shift digest of it can be printed right after. */
export function useCloseShift() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: closeShift, onSuccess: () => qc.invalidateQueries({ queryKey: shiftLogKeys.logs() }) });
}
