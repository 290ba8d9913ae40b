import { z } from 'zod';

const isoSchema = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 time with Z or an offset' });
const optionalText = (max: number) => z.string().trim().max(max).optional().transform((v) => (v ? v : undefined));

const auditFilters = z.object({
  /** What was changed: site, tank, probe, user, … */
  entity: optionalText(40),
  /** An action ('user.update') or its start ('user.'). */
  action: optionalText(60),
  userId: z.coerce.number().int().positive().optional(),
  from: isoSchema.optional(),
  to: isoSchema.optional(),
});
const fromBeforeTo = (v: { from?: string; to?: string }) => !v.from || !v.to || Date.parse(v.from) < Date.parse(v.to);
const fromBeforeToIssue = { message: 'from must be before to', path: ['from'] };

/** Filters of the audit trail screen (query string), newest first. */
export const auditQuerySchema = auditFilters
  .extend({ limit: z.coerce.number().int().min(1).max(500).default(100) })
  .refine(fromBeforeTo, fromBeforeToIssue);
export type AuditQuery = z.infer<typeof auditQuerySchema>;

/** The same filters for the CSV download, which streams every matching entry (no page limit). */
export const auditExportQuerySchema = auditFilters.refine(fromBeforeTo, fromBeforeToIssue);
export type AuditFilters = z.infer<typeof auditExportQuerySchema>;

/** One change as recorded: who, when, what, the state before and after, and the reason given. */
export type AuditEntryView = {
  id: number;
  at: string;
  user: { id: number; name: string; email: string } | null;
  action: string;
  entity: string;
  entityId: string | null;
  before: unknown;
  after: unknown;
  reason: string | null;
};

export type AuditPage = {
  entries: AuditEntryView[];
  /** Counted over the whole filter (the list is capped at `limit`). */
  total: number;
  /** Every kind of entity in the trail, for the filter. */
  entities: string[];
};

/** CSV columns of the audit export, in order. */
export const AUDIT_EXPORT_COLUMNS = [
  'id', 'at_utc', 'user_id', 'user_name', 'user_email', 'action', 'entity', 'entity_id', 'reason', 'before_json', 'after_json',
] as const;
