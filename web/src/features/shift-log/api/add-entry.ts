import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LogEntryInput, ShiftLogEntryView } from '@shared/schemas/shifts';
import { api } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

export async function addEntry(input: LogEntryInput): Promise<ShiftLogEntryView> {
  return (await api.post<{ entry: ShiftLogEntryView }>('/api/shift-log/entries', input)).entry;
}

export function useAddEntry() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: addEntry, onSuccess: () => qc.invalidateQueries({ queryKey: shiftLogKeys.logs() }) });
}
