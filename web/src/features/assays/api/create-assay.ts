import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Assay, AssayEntryInput } from '@shared/schemas/assays';
import { api } from '../../../lib/api-client';
import { assayKeys } from './assay-keys';

export async function createAssay(input: AssayEntryInput): Promise<Assay> {
  return (await api.post<{ assay: Assay }>('/api/assays', input)).assay;
}

export function useCreateAssay() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createAssay, onSuccess: () => qc.invalidateQueries({ queryKey: assayKeys.all }) });
}
