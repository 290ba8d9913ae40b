import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BandChange } from '@shared/schemas/bands';
import { api } from '../../../lib/api-client';
import { bandKeys } from './band-keys';

export type BandDecision = 'approve' | 'reject' | 'withdraw';

/** POST /api/bands/changes/:id/{approve|reject|withdraw}: the three outcomes of a pending change. */
export async function decideBandChange({ id, decision, note }: { id: number; decision: BandDecision; note?: string }): Promise<BandChange> {
  return (await api.post<{ change: BandChange }>(`/api/bands/changes/${id}/${decision}`, note ? { note } : {})).change;
}

export function useDecideBandChange(onChanged?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decideBandChange,
    onSuccess: () => {
      onChanged?.();
      return qc.invalidateQueries({ queryKey: bandKeys.all });
    },
  });
}
