import type { Readable } from 'node:stream';
import { QueryTypes } from 'sequelize';
import type { AuditEntryView, AuditFilters, AuditQuery } from '../../../../shared/schemas/audit.ts';
import { rawPool } from '../../db/database.ts';
import { AuditEntry } from '../../db/models.ts';
import type { PoolConnection } from '../../db/pool.ts';
import { toSqlTs } from '../../db/timestamps.ts';

const likePrefix = (s: string) => `${s.replace(/[\\%_]/g, (c) => `\\${c}`)}.%`;

/** WHERE clause of one filter over audit_log a. An action filter matches itself and its sub-actions ('user' → 'user.update'). */
function where(q: AuditFilters): { sql: string; replacements: Record<string, string | number> } {
  const parts: string[] = [];
  const replacements: Record<string, string | number> = {};
  if (q.entity !== undefined) {
    parts.push('a.entity = :entity');
    replacements.entity = q.entity;
  }
  if (q.action !== undefined) {
    parts.push('(a.action = :action OR a.action LIKE :actionPrefix)');
    replacements.action = q.action;
    replacements.actionPrefix = likePrefix(q.action);
  }
  if (q.userId !== undefined) {
    parts.push('a.user_id = :userId');
    replacements.userId = q.userId;
  }
  if (q.from !== undefined) {
    parts.push('a.at >= :from');
    replacements.from = toSqlTs(Date.parse(q.from));
  }
  if (q.to !== undefined) {
    parts.push('a.at < :to');
    replacements.to = toSqlTs(Date.parse(q.to));
  }
  return { sql: parts.length ? `WHERE ${parts.join(' AND ')}` : '', replacements };
}

const FROM = 'FROM audit_log a LEFT JOIN users u ON u.id = a.user_id';

/** JSON columns come back as text on MariaDB (JSON is LONGTEXT there); a value that is not JSON is kept as text. */
function json(v: unknown): unknown {
  if (typeof v !== 'string') return v ?? null;
  try {
    return JSON.parse(v);
  } catch {
    return v;
  }
}

export const auditTrailRepository = {
  async list(q: AuditQuery): Promise<AuditEntryView[]> {
    const w = where(q);
    const rows = await AuditEntry.sequelize!.query<{
      id: number; at: Date; user_id: number | null; user_name: string | null; user_email: string | null; action: string; entity: string;
      entity_id: string | null; before_json: unknown; after_json: unknown; reason: string | null;
    }>(`SELECT a.id, a.at, a.user_id, u.name AS user_name, u.email AS user_email, a.action, a.entity, a.entity_id, a.before_json, a.after_json, a.reason
          ${FROM} ${w.sql} ORDER BY a.at DESC, a.id DESC LIMIT ${q.limit}`, { replacements: w.replacements, type: QueryTypes.SELECT });
    return rows.map((r) => ({
      id: Number(r.id), at: new Date(r.at).toISOString(),
      user: r.user_id === null ? null : { id: r.user_id, name: r.user_name ?? '', email: r.user_email ?? '' },
      action: r.action, entity: r.entity, entityId: r.entity_id, before: json(r.before_json), after: json(r.after_json), reason: r.reason,
    }));
  },

  async count(q: AuditFilters): Promise<number> {
    const w = where(q);
    const [row] = await AuditEntry.sequelize!.query<{ n: number }>(`SELECT COUNT(*) AS n ${FROM} ${w.sql}`, { replacements: w.replacements, type: QueryTypes.SELECT });
    return Number(row.n);
  },

  async entities(): Promise<string[]> {
    const rows = await AuditEntry.sequelize!.query<{ entity: string }>('SELECT DISTINCT entity FROM audit_log ORDER BY entity', { type: QueryTypes.SELECT });
    return rows.map((r) => r.entity);
  },

  /**
   * Every entry of the filter, newest first, as arrays in AUDIT_EXPORT_COLUMNS order, streamed on
   * a dedicated connection the caller releases. JSON stays the text MariaDB holds.
   */
  async openExport(q: AuditFilters): Promise<{ conn: PoolConnection; rows: Readable }> {
    const w = where(q);
    const conn = await rawPool(AuditEntry.sequelize!).getConnection();
    const sql = `SELECT a.id, a.at, a.user_id, u.name, u.email, a.action, a.entity, a.entity_id, a.reason, a.before_json, a.after_json
                   ${FROM} ${w.sql} ORDER BY a.at DESC, a.id DESC`;
    return { conn, rows: conn.queryStream({ sql, namedPlaceholders: true, rowsAsArray: true }, w.replacements) };
  },
};
