import { useMutation } from '@tanstack/react-query';
import type { CsvPreview } from '@shared/schemas/assays';
import { apiUpload } from '../../../lib/api-client';

export type UploadArgs = { file: File; onProgress?: (fraction: number) => void };

/** Checks every row and lists every problem; stores nothing. */
export function previewAssayCsv({ file, onProgress }: UploadArgs): Promise<CsvPreview> {
  return apiUpload<CsvPreview>('/api/assays/csv/preview', file, file.name, { onProgress });
}

export function usePreviewAssayCsv() {
  return useMutation({ mutationFn: previewAssayCsv });
}
