import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ImportJobView } from '@shared/schemas/import';
import { apiUpload } from '../../../lib/api-client';
import { digestKeys } from './digest-keys';

export type StartImportInput = { file: File; onProgress?: (fraction: number) => void };

export async function startImport({ file, onProgress }: StartImportInput): Promise<ImportJobView> {
  return (await apiUpload<{ job: ImportJobView }>('/api/readings/imports', file, file.name, { onProgress })).job;
}

/** Uploads the file; the server answers at once with a queued job to follow. */
export function useStartImport() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: startImport,
    onSuccess: (job) => {
      qc.setQueryData(digestKeys.importJob(job.id), job);
      void qc.invalidateQueries({ queryKey: digestKeys.imports(), exact: true });
    },
  });
}
