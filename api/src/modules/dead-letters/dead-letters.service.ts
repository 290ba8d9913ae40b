import type { DeadLetterFilters, DeadLetterPage, DeadLetterQuery } from '../../../../shared/schemas/dead-letters.ts';
import { isoFromSql } from '../../lib/csv.ts';
import { deadLettersRepository as repo } from './dead-letters.repository.ts';

/** 'dead-letters-kestrel-20261204.csv': the site when one is chosen, and the day of the download (UTC). */
function exportFileName(q: DeadLetterFilters): string {
  const site = q.site ? `-${q.site.replace(/[^A-Za-z0-9_-]+/g, '_')}` : '';
  return `ferrisight-dead-letters${site}-${new Date().toISOString().slice(0, 10).replace(/-/g, '')}.csv`;
}

export const deadLettersService = {
  async page(q: DeadLetterQuery, retentionDays: number): Promise<DeadLetterPage> {
    const [deadLetters, conflicts, counts] = await Promise.all([repo.list(q), repo.conflicts(q), repo.counts(q)]);
    return { deadLetters, conflicts, counts, retention: { deadLetterDays: retentionDays } };
  },

  openExport: (q: DeadLetterFilters) => repo.openExport(q),
  exportFileName,
  /** The received time as ISO 8601; the rest as stored (payloads are text, never interpreted). */
  exportRow: (row: unknown[]): unknown[] => [row[0], isoFromSql(row[1]), ...row.slice(2)],
};
