import type { Transaction } from 'sequelize';
import { AuditEntry } from '../db/models.ts';

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
  await AuditEntry.create({
    at: new Date(),
    userId: entry.userId,
    action: entry.action,
    entity: entry.entity,
    entityId: entry.entityId == null ? null : String(entry.entityId),
    beforeJson: entry.before ?? null,
    afterJson: entry.after ?? null,
    reason: entry.reason ?? null,
  }, { transaction });
}
