import type { ExportSource } from '@shared/schemas/export';
import { withQuery } from '../../../lib/api-client';

export type ExportParams = { tankIds: number[]; from: string; to: string; source: ExportSource };

/**
 * Address of the streamed CSV. The browser downloads it straight to disk through a link, so
 * a year of raw readings never has to fit in the page's memory.
 */
export function exportReadingsUrl(p: ExportParams): string {
  return withQuery('/api/readings/export', { tankIds: p.tankIds.join(','), from: p.from, to: p.to, source: p.source });
}
