import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { BandChange, BandChangeInput } from '@shared/schemas/bands';
import { api } from '../../../lib/api-client';
import { bandKeys } from './band-keys';

export async function changeBand({ tankId, input }: { tankId: number; input: BandChangeInput }): Promise<BandChange> {
  return (await api.put<{ change: BandChange }>(`/api/bands/${tankId}`, input)).change;
}

/** Applied at once, or left pending when the change is large; `onChanged` lets the app refresh other screens. */
export function useChangeBand(onChanged?: () => void) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: changeBand,
    onSuccess: () => {
      onChanged?.();
      return qc.invalidateQueries({ queryKey: bandKeys.all });
    },
  });
}
