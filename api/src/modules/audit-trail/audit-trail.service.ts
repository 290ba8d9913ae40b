import { AUDIT_EXPORT_COLUMNS, type AuditFilters, type AuditPage, type AuditQuery } from '../../../../shared/schemas/audit.ts';
import { isoFromSql, type CsvExport } from '../../lib/csv.ts';
import { auditTrailRepository as repo } from './audit-trail.repository.ts';

const text = (v: unknown) => (v == null ? '' : typeof v === 'string' ? v : JSON.stringify(v));

/** The audit trail as recorded: read-only here (the table takes only inserts). */
export const auditTrailService = {
  async page(q: AuditQuery): Promise<AuditPage> {
    const [entries, total, entities] = await Promise.all([repo.list(q), repo.count(q), repo.entities()]);
    return { entries, total, entities };
  },

  /** 'ferrisight-audit-trail-tank-20261204.csv'; time as ISO 8601, before and after as the JSON text that was recorded. */
  async export(q: AuditFilters): Promise<CsvExport> {
    const entity = q.entity ? `-${q.entity.replace(/[^A-Za-z0-9_-]+/g, '_')}` : '';
    return {
      fileName: `ferrisight-audit-trail${entity}-${new Date().toISOString().slice(0, 10).replace(/-/g, '')}.csv`,
      columns: AUDIT_EXPORT_COLUMNS,
      source: await repo.openExport(q),
      shape: (row) => [row[0], isoFromSql(row[1]), ...row.slice(2, 9), text(row[9]), text(row[10])],
    };
  },
};
