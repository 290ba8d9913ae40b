import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ShiftPatternInput, ShiftPatternView } from '@shared/schemas/shifts';
import { api } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

export async function saveShiftPattern(input: ShiftPatternInput): Promise<ShiftPatternView> {
  return (await api.put<{ pattern: ShiftPatternView }>('/api/shifts/pattern', input)).pattern;
}

/** A new pattern moves every shift not yet written to, so the log is reloaded with it. */
export function useSaveShiftPattern() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: saveShiftPattern, onSuccess: () => qc.invalidateQueries({ queryKey: shiftLogKeys.all }) });
}
