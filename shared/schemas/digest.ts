import { z } from 'zod';
import type { BandMinutes } from '../digest/time-in-band.ts';
import type { Sparkline } from '../digest/sparkline.ts';
import type { ShiftLogEntryView, ShiftView } from './shifts.ts';

const isoSchema = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 time with Z or an offset' });
export const MAX_DIGEST_DAYS = 31;

const digestFields = {
  siteId: z.coerce.number().int().positive().optional(),
  shiftStart: isoSchema.optional(),
  from: isoSchema.optional(),
  to: isoSchema.optional(),
};
type DigestPeriod = { shiftStart?: string; from?: string; to?: string };

function periodRules<S extends z.ZodType<DigestPeriod>>(schema: S) {
  return schema
    .refine((v) => (v.from === undefined) === (v.to === undefined), { message: 'Give both from and to', path: ['to'] })
    .refine((v) => !(v.shiftStart && v.from), { message: 'Give a shift or a range, not both', path: ['shiftStart'] })
    .refine((v) => !v.from || !v.to || Date.parse(v.from) < Date.parse(v.to), { message: 'from must be before to', path: ['from'] })
    .refine((v) => !v.from || !v.to || Date.parse(v.to) - Date.parse(v.from) <= MAX_DIGEST_DAYS * 86_400_000, {
      message: `At most ${MAX_DIGEST_DAYS} days`, path: ['to'],
    });
}

/** A shift (by its start) or a free range; neither means the last closed shift. */
export const digestQuerySchema = periodRules(z.object(digestFields));
export type DigestQuery = z.infer<typeof digestQuerySchema>;

/** The digest's tables, each downloadable as CSV. */
export const DIGEST_TABLES = ['tanks', 'alarms', 'shift-log', 'band-changes', 'calibrations', 'assays', 'probe-checks'] as const;
export type DigestTableName = (typeof DIGEST_TABLES)[number];

/** One table of a digest as CSV: the same period as the screen, and which table. */
export const digestExportQuerySchema = periodRules(z.object({ ...digestFields, table: z.enum(DIGEST_TABLES) }));
export type DigestExportQuery = z.infer<typeof digestExportQuerySchema>;

export type Stat = { mean: number; min: number; max: number };
export type BandSpanView = { from: string; low: number; high: number };

export type TankDigest = {
  tankId: number;
  tag: string;
  name: string;
  circuitTag: string;
  /** Bands in force over the range, oldest first (one entry when the band did not change). */
  bands: BandSpanView[];
  minutes: BandMinutes;
  /** Geometric mean from the mean log ratio; null when there was no data. */
  ratio: Stat | null;
  orpMv: Stat | null;
  tempC: Stat | null;
  spark: Sparkline;
};

/** A section fed by another component's tables; `available` is false while those tables do not exist. */
export type Section<T> = { available: boolean; items: T[] };

export type AlarmSpan = {
  id: number;
  tankId: number | null;
  tankTag: string | null;
  priority: number | null;
  kind: string | null;
  raisedAt: string;
  acknowledgedAt: string | null;
  clearedAt: string | null;
  shelvedAt: string | null;
};

export type AlarmFigures = {
  available: boolean;
  raised: number;
  acknowledged: number;
  shelved: number;
  escalationsSent: number;
  /** Raised in the range and not acknowledged (yet). */
  waiting: number;
  ackMeanS: number | null;
  ackMaxS: number | null;
  timeline: AlarmSpan[];
};

export type DigestEvent = { at: string; tankId: number | null; tankTag: string | null; summary: string; by: string | null };

export type DigestResponse = {
  site: { id: number; tag: string; name: string; timeZone: string };
  from: string;
  to: string;
  shift: ShiftView | null;
  tanks: TankDigest[];
  alarms: AlarmFigures;
  bandChanges: Section<DigestEvent>;
  calibrations: Section<DigestEvent>;
  assays: Section<DigestEvent>;
  probeChecks: Section<DigestEvent>;
  log: ShiftLogEntryView[];
  computedMs: number;
};
