import {
  CONFLICT_EXPORT_COLUMNS, DEAD_LETTER_EXPORT_COLUMNS, type DeadLetterExportQuery, type DeadLetterPage, type DeadLetterQuery,
} from '../../../../shared/schemas/dead-letters.ts';
import { isoFromSql, type CsvExport } from '../../lib/csv.ts';
import { deadLettersRepository as repo } from './dead-letters.repository.ts';

/** 'ferrisight-conflicts-kestrel-20261204.csv': the table, the site when one is chosen, and the day of the download (UTC). */
function fileName(q: DeadLetterExportQuery): string {
  const site = q.site ? `-${q.site.replace(/[^A-Za-z0-9_-]+/g, '_')}` : '';
  return `ferrisight-${q.table}${site}-${new Date().toISOString().slice(0, 10).replace(/-/g, '')}.csv`;
}

export const deadLettersService = {
  async page(q: DeadLetterQuery, retentionDays: number): Promise<DeadLetterPage> {
    const [deadLetters, conflicts, counts] = await Promise.all([repo.list(q), repo.conflicts(q), repo.counts(q)]);
    return { deadLetters, conflicts, counts, retention: { deadLetterDays: retentionDays } };
  },

  /** Times as ISO 8601; the rest as stored (payloads are text, never interpreted). */
  async export(q: DeadLetterExportQuery): Promise<CsvExport> {
    const conflicts = q.table === 'conflicts';
    return {
      fileName: fileName(q),
      columns: conflicts ? CONFLICT_EXPORT_COLUMNS : DEAD_LETTER_EXPORT_COLUMNS,
      source: await repo.openExport(q, q.table),
      shape: conflicts
        ? (row) => [row[0], isoFromSql(row[1]), row[2], row[3], isoFromSql(row[4]), ...row.slice(5)]
        : (row) => [row[0], isoFromSql(row[1]), ...row.slice(2)],
    };
  },
};
