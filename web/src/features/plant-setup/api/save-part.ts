import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PartKind } from './plant-setup-keys';

/** POST /api/plant-setup/<kind> (create) or PATCH /api/plant-setup/<kind>/<id> (edit, with a reason). */
export async function savePart(kind: PartKind, id: number | null, values: object): Promise<Record<string, unknown>> {
  return id === null
    ? api.post<Record<string, unknown>>(`/api/plant-setup/${kind}`, values)
    : api.patch<Record<string, unknown>>(`/api/plant-setup/${kind}/${id}`, values);
}

export function useSavePart(kind: PartKind, id: number | null) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (values: object) => savePart(kind, id, values),
    // The Floor's plant tree changes too.
    onSuccess: () => qc.invalidateQueries(),
  });
}
