import type { Transaction } from 'sequelize';
import { AuditEntry } from '../db/models.ts';
import { toSqlTs, type PoolConnection } from '../db/pool.ts';

export type AuditInput = {
  userId: number | null;
  action: string;
  entity: string;
  entityId?: string | number | null;
  before?: unknown;
  after?: unknown;
  reason?: string | null;
};

/** Append-only audit trail: there is deliberately no update or delete here. */
export async function writeAudit(entry: AuditInput, transaction?: Transaction): Promise<void> {
  await AuditEntry.create({ at: new Date(), ...auditRow(entry) }, { transaction });
}

/** The same entry inside a raw-pool transaction (work done on the raw pool is audited in its own transaction). */
export async function writeAuditOn(conn: PoolConnection, entry: AuditInput): Promise<void> {
  const r = auditRow(entry);
  const json = (v: unknown) => (v === null ? null : JSON.stringify(v));
  await conn.query(
    'INSERT INTO audit_log (at, user_id, action, entity, entity_id, before_json, after_json, reason) VALUES (?, ?, ?, ?, ?, ?, ?, ?)',
    [toSqlTs(Date.now()), r.userId, r.action, r.entity, r.entityId, json(r.beforeJson), json(r.afterJson), r.reason]);
}

function auditRow(entry: AuditInput) {
  return {
    userId: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId == null ? null : String(entry.entityId),
    beforeJson: entry.before ?? null,
    afterJson: entry.after ?? null,
    reason: entry.reason ?? null,
  };
}
