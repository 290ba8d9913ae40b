import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BandChange, BandCopyInput } from '@shared/schemas/bands';
import { api } from '../../../lib/api-client';
import { bandKeys } from './band-keys';

export async function copyBand({ fromTankId, input }: { fromTankId: number; input: BandCopyInput }): Promise<BandChange[]> {
  return (await api.post<{ changes: BandChange[] }>(`/api/bands/${fromTankId}/copy`, input)).changes;
}

/** One step, one record per tank; refused as a whole when any tank cannot take it. */
export function useCopyBand(onChanged?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: copyBand,
    onSuccess: () => {
      onChanged?.();
      return qc.invalidateQueries({ queryKey: bandKeys.all });
    },
  });
}
