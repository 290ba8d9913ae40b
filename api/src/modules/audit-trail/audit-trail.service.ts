import type { AuditFilters, AuditPage, AuditQuery } from '../../../../shared/schemas/audit.ts';
import { isoFromSql } from '../../lib/csv.ts';
import { auditTrailRepository as repo } from './audit-trail.repository.ts';

/** The audit trail as recorded: read-only here (the table takes only inserts). */
export const auditTrailService = {
  async page(q: AuditQuery): Promise<AuditPage> {
    const [entries, total, entities] = await Promise.all([repo.list(q), repo.count(q), repo.entities()]);
    return { entries, total, entities };
  },

  openExport: (q: AuditFilters) => repo.openExport(q),

  exportFileName: (q: AuditFilters) =>
    `ferrisight-audit-trail${q.entity ? `-${q.entity.replace(/[^A-Za-z0-9_-]+/g, '_')}` : ''}-${new Date().toISOString().slice(0, 10).replace(/-/g, '')}.csv`,

  /** Time as ISO 8601; before and after as the JSON text that was recorded. */
  exportRow: (row: unknown[]): unknown[] => {
    const text = (v: unknown) => (v == null ? '' : typeof v === 'string' ? v : JSON.stringify(v));
    return [row[0], isoFromSql(row[1]), ...row.slice(2, 9), text(row[9]), text(row[10])];
  },
};
