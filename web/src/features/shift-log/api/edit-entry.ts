import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ShiftLogEntryView } from '@shared/schemas/shifts';
import { api } from '../../../lib/api-client';
import { shiftLogKeys } from './shift-log-keys';

export async function editEntry({ id, body }: { id: number; body: string }): Promise<ShiftLogEntryView> {
  return (await api.patch<{ entry: ShiftLogEntryView }>(`/api/shift-log/entries/${id}`, { body })).entry;
}

/** Only the author, only before the handover: the server says no otherwise (403 / 409). */
export function useEditEntry() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: editEntry, onSettled: () => qc.invalidateQueries({ queryKey: shiftLogKeys.logs() }) });
}
