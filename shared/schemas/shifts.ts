import { z } from 'zod';

const isoSchema = z.iso.datetime({ offset: true, message: 'Use an ISO 8601 time with Z or an offset' });
const optionalId = z.coerce.number().int().positive().optional();

/** Shift pattern as entered: two 12-hour or three 8-hour shifts, first start in site time. */
export const shiftPatternInputSchema = z.object({
  siteId: z.number().int().positive().optional(),
  shiftsPerDay: z.union([z.literal(2), z.literal(3)], { message: 'Choose two 12-hour or three 8-hour shifts' }),
  firstStart: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Enter the first start as HH:MM (site time)'),
});
export type ShiftPatternInput = z.infer<typeof shiftPatternInputSchema>;

export type ShiftPatternView = {
  siteId: number;
  timeZone: string;
  shiftsPerDay: 2 | 3;
  firstStart: string;
  /** False while the site runs on the default pattern (nobody saved one yet). */
  saved: boolean;
};

export type ShiftStatus = 'open' | 'closed' | 'upcoming';

export type ShiftView = {
  /** Null until the shift gets its first entry or is closed. */
  id: number | null;
  siteId: number;
  startsAt: string;
  endsAt: string;
  status: ShiftStatus;
  closedAt: string | null;
  closedBy: { id: number; name: string } | null;
  handoverNote: string | null;
};

export type ShiftLogEntryView = {
  id: number;
  shiftId: number;
  at: string;
  author: { id: number; name: string; role: string };
  body: string;
  tank: { id: number; tag: string } | null;
  alarmId: number | null;
  correctsId: number | null;
  editedAt: string | null;
};

export type ShiftLogResponse = { shift: ShiftView; entries: ShiftLogEntryView[]; timeZone: string };

export const shiftLogQuerySchema = z.object({ siteId: optionalId, at: isoSchema.optional() });
export const shiftListQuerySchema = z.object({
  siteId: optionalId,
  count: z.coerce.number().int().min(1).max(200).default(21),
});

export const logEntryInputSchema = z.object({
  siteId: z.number().int().positive().optional(),
  body: z.string().trim().min(1, 'Write something').max(4000, 'At most 4000 characters'),
  tankId: z.number().int().positive().nullable().optional(),
  alarmId: z.number().int().positive().nullable().optional(),
  /** A correction points at the entry it corrects; the original stays as it was. */
  correctsId: z.number().int().positive().nullable().optional(),
});
export type LogEntryInput = z.infer<typeof logEntryInputSchema>;

export const logEntryEditSchema = z.object({
  body: z.string().trim().min(1, 'Write something').max(4000, 'At most 4000 characters'),
});

export const closeShiftSchema = z.object({
  siteId: z.number().int().positive().optional(),
  startsAt: isoSchema,
  handoverNote: z.string().trim().min(1, 'Write the handover note').max(8000, 'At most 8000 characters'),
});
export type CloseShiftInput = z.infer<typeof closeShiftSchema>;
