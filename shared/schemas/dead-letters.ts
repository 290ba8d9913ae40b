import { z } from 'zod';

/** Short kinds of a dead letter's reason, for filters and counts (the full reason is kept too). */
export const DEAD_LETTER_KINDS = [
  'too-large', 'forbidden-topic', 'unknown-topic', 'not-utf8', 'bad-json', 'bad-fields', 'unknown-site',
  'unknown-probe', 'wrong-site', 'clock', 'no-calibration', 'conversion', 'other',
] as const;
export type DeadLetterKind = (typeof DEAD_LETTER_KINDS)[number];

export const DEAD_LETTER_KIND_LABELS: Record<DeadLetterKind, string> = {
  'too-large': 'Over the size limit',
  'forbidden-topic': 'Topic not allowed for this gateway',
  'unknown-topic': 'Unknown topic',
  'not-utf8': 'Not UTF-8',
  'bad-json': 'Not JSON',
  'bad-fields': 'Wrong or missing fields',
  'unknown-site': 'Unknown site',
  'unknown-probe': 'Unknown probe',
  'wrong-site': 'Probe of another site',
  clock: 'Time out of range',
  'no-calibration': 'Tank not calibrated',
  conversion: 'Conversion failed',
  other: 'Other',
};

const optionalText = (max: number) => z.string().trim().max(max).optional().transform((v) => (v ? v : undefined));

const deadLetterFilters = z.object({
  site: optionalText(40),
  gateway: optionalText(64),
  probe: optionalText(40),
  kind: z.enum(DEAD_LETTER_KINDS).optional(),
  from: z.iso.datetime({ offset: true }).optional(),
  to: z.iso.datetime({ offset: true }).optional(),
});
const fromBeforeTo = (v: { from?: string; to?: string }) => !v.from || !v.to || Date.parse(v.from) < Date.parse(v.to);
const fromBeforeToIssue = { message: 'from must be before to', path: ['from'] };

/** Filters of the dead letters and conflicts screen (query string). */
export const deadLetterQuerySchema = deadLetterFilters
  .extend({ limit: z.coerce.number().int().min(1).max(500).default(100) })
  .refine(fromBeforeTo, fromBeforeToIssue);
export type DeadLetterFilters = z.infer<typeof deadLetterFilters>;

/** The same filters for a CSV download of either table, which streams every matching row (no page limit). */
export const deadLetterExportQuerySchema = deadLetterFilters
  .extend({ table: z.enum(['dead-letters', 'conflicts']).default('dead-letters') })
  .refine(fromBeforeTo, fromBeforeToIssue);
export type DeadLetterExportQuery = z.infer<typeof deadLetterExportQuerySchema>;
export type DeadLetterQuery = z.infer<typeof deadLetterQuerySchema>;

/** CSV columns of the dead-letter and conflict exports, in order. */
export const DEAD_LETTER_EXPORT_COLUMNS = [
  'id', 'received_at_utc', 'gateway', 'site', 'probe', 'topic', 'kind', 'reason', 'payload_bytes', 'payload',
] as const;
export const CONFLICT_EXPORT_COLUMNS = [
  'id', 'received_at_utc', 'site', 'probe', 'reading_time_utc', 'stored_orp_mv', 'stored_temp_c', 'incoming_orp_mv', 'incoming_temp_c', 'incoming_seq', 'source',
] as const;

export type DeadLetterRow = {
  id: number;
  receivedAt: string;
  topic: string;
  /** Stored text (first 4 KB, or hex: for bytes that are not UTF-8); render as text, never as markup. */
  payload: string;
  payloadBytes: number;
  reason: string;
  kind: DeadLetterKind;
  gateway: string | null;
  siteTag: string | null;
  probeTag: string | null;
};

export type ConflictRow = {
  id: number;
  receivedAt: string;
  probeTag: string | null;
  siteTag: string | null;
  ts: string;
  storedOrpMv: number;
  storedTempC: number;
  incomingOrpMv: number;
  incomingTempC: number;
  incomingSeq: number | null;
  source: string;
};

export type DeadLetterPage = {
  deadLetters: DeadLetterRow[];
  conflicts: ConflictRow[];
  /** Counted in the database over the whole filter (the lists are capped at `limit`). */
  counts: { deadLetters: number; conflicts: number; byKind: Partial<Record<DeadLetterKind, number>> };
  retention: { deadLetterDays: number };
};
