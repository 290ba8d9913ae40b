import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PartKind } from './plant-setup-keys';

export const retirePart = (kind: PartKind, id: number, reason: string) =>
  api.post<Record<string, unknown>>(`/api/plant-setup/${kind}/${id}/retire`, { reason });

export function useRetirePart(kind: PartKind, id: number) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: (reason: string) => retirePart(kind, id, reason), onSuccess: () => qc.invalidateQueries() });
}
