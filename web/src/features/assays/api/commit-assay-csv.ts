import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CsvCommitResult } from '@shared/schemas/assays';
import { apiUpload } from '../../../lib/api-client';
import { assayKeys } from './assay-keys';
import type { UploadArgs } from './preview-assay-csv';

/** Stores every row in one transaction, or none when any row is wrong (the server checks again). */
export function commitAssayCsv({ file, onProgress }: UploadArgs): Promise<CsvCommitResult> {
  return apiUpload<CsvCommitResult>('/api/assays/csv/commit', file, file.name, { onProgress });
}

export function useCommitAssayCsv() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: commitAssayCsv, onSuccess: () => qc.invalidateQueries({ queryKey: assayKeys.all }) });
}
