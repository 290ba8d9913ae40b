import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Assay } from '@shared/schemas/assays';
import { api } from '../../../lib/api-client';
import { assayKeys } from './assay-keys';

/** The row stays in the record, marked retracted with the reason; it no longer counts anywhere. */
export async function retractAssay({ id, reason }: { id: number; reason: string }): Promise<Assay> {
  return (await api.post<{ assay: Assay }>(`/api/assays/${id}/retract`, { reason })).assay;
}

export function useRetractAssay() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: retractAssay, onSuccess: () => qc.invalidateQueries({ queryKey: assayKeys.all }) });
}
