import { z } from 'zod';
import { ALARM_KINDS, KIND_INFO, TANK_ALARM_KINDS, PRIORITIES, type AlarmKind, type Priority } from '../alarms/kinds.ts';
import { ALARM_HOW, ALARM_STATES, MAX_SHELVE_MIN, type AlarmState } from '../alarms/states.ts';

/** Alarm definitions, lifecycle actions and views: used by the API, the engine and the Alarm desk forms. */
const text = (max: number, what: string) => z.string().trim().min(1, `Enter ${what}`).max(max);
const reason = z.string().trim().min(3, 'Give a reason (at least 3 characters)').max(500);

export const rationalisationSchema = z.object({
  cause: text(1000, 'the likely cause'),
  consequence: text(1000, 'the consequence of not acting'),
  action: text(1000, 'what to do'),
  responseMin: z.number().int().min(1, 'At least 1 minute').max(1440, 'At most 24 h'),
});
export type Rationalisation = z.infer<typeof rationalisationSchema>;

const settingsShape = {
  priority: z.number().int().min(1).max(3),
  threshold: z.number().finite().nullable(),
  deadband: z.number().finite().min(0, 'Deadband cannot be negative').max(1000),
  onDelayS: z.number().int().min(0).max(3600, 'At most 1 h'),
  offDelayS: z.number().int().min(0).max(3600, 'At most 1 h'),
  windowS: z.number().int().min(30, 'At least 30 s').max(3 * 3600, 'At most 3 h').nullable(),
  rationalisation: rationalisationSchema,
};

/** Threshold and window are required exactly where the kind uses them. */
function checkKindFields(v: { kind: AlarmKind; threshold?: number | null; windowS?: number | null }, ctx: z.RefinementCtx) {
  const info = KIND_INFO[v.kind];
  if (info.limitFrom === 'threshold' && v.threshold == null) ctx.addIssue({ code: 'custom', path: ['threshold'], message: `${info.label} needs a threshold (${info.unit})` });
  if (info.windowed && v.windowS == null) ctx.addIssue({ code: 'custom', path: ['windowS'], message: `${info.label} needs a window` });
}

export const definitionSettingsSchema = z.object({ kind: z.enum(TANK_ALARM_KINDS), ...settingsShape }).superRefine(checkKindFields);
export type DefinitionSettings = z.infer<typeof definitionSettingsSchema>;

export const createDefinitionSchema = z
  .object({ tankId: z.number().int().positive(), kind: z.enum(TANK_ALARM_KINDS), ...settingsShape, reason })
  .superRefine(checkKindFields);
export type CreateDefinitionInput = z.infer<typeof createDefinitionSchema>;

/** Edits never change kind or tank (make a new definition instead); a reason is always recorded. */
export const updateDefinitionSchema = z
  .object({ ...settingsShape, rationalisation: rationalisationSchema.partial() })
  .partial()
  .extend({ reason })
  .refine((v) => Object.keys(v).some((k) => k !== 'reason'), 'Nothing to change');
export type UpdateDefinitionInput = z.infer<typeof updateDefinitionSchema>;

export const applyTemplateSchema = z.object({
  tankIds: z.array(z.number().int().positive()).min(1).max(200),
  templateId: z.string().min(1).max(60),
  reason,
});
export type ApplyTemplateInput = z.infer<typeof applyTemplateSchema>;

export const acknowledgeSchema = z.object({ comment: z.string().trim().max(1000).optional() });
export const commentSchema = z.object({ text: text(1000, 'a comment') });
/** Out of service always ends: the alarm returns to service on its own when the period runs out. */
export const MAX_OOS_HOURS = 7 * 24;
export const oosSchema = z.object({
  reason,
  durationH: z.number({ message: 'Choose how long' }).min(0.25, 'At least 15 minutes').max(MAX_OOS_HOURS, 'At most 7 days'),
});
export type OosInput = z.infer<typeof oosSchema>;
/** Returning to service says what was done (e.g. probe cleaned and checked against a standard). */
export const returnToServiceSchema = z.object({ comment: z.string().trim().min(3, 'Say what was done (at least 3 characters)').max(1000) });

/** Shelve: reason and expiry required, at most 12 h ahead; either a duration or an end time. */
export const shelveSchema = z
  .object({
    reason,
    durationMin: z.number().int().min(1, 'At least 1 minute').max(MAX_SHELVE_MIN, 'At most 12 h').optional(),
    until: z.iso.datetime({ offset: true }).optional(),
  })
  .refine((v) => (v.durationMin === undefined) !== (v.until === undefined), { message: 'Give either a duration or an end time', path: ['durationMin'] });
export type ShelveInput = z.infer<typeof shelveSchema>;

const optionalInt = z.coerce.number().int().positive().optional();
export const activeQuerySchema = z.object({
  site: z.string().max(40).optional(),
  circuit: optionalInt,
  tank: optionalInt,
  priority: z.coerce.number().int().min(1).max(3).optional(),
  state: z.enum(ALARM_STATES).optional(),
});
export type ActiveQuery = z.infer<typeof activeQuerySchema>;

export const historyQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }),
  to: z.iso.datetime({ offset: true }),
  site: z.string().max(40).optional(),
  tank: optionalInt,
  priority: z.coerce.number().int().min(1).max(3).optional(),
  kind: z.enum(ALARM_KINDS).optional(),
  q: z.string().trim().max(100).optional(),
  limit: z.coerce.number().int().min(1).max(5000).default(200),
  offset: z.coerce.number().int().min(0).default(0),
}).refine((v) => Date.parse(v.from) < Date.parse(v.to), { message: 'from must be before to', path: ['from'] });
export type HistoryQuery = z.infer<typeof historyQuerySchema>;

export const figuresQuerySchema = z.object({
  from: z.iso.datetime({ offset: true }),
  to: z.iso.datetime({ offset: true }),
  site: z.string().max(40).optional(),
}).refine((v) => Date.parse(v.from) < Date.parse(v.to) && Date.parse(v.to) - Date.parse(v.from) <= 31 * 86_400_000, { message: 'from must be before to, at most 31 days apart', path: ['from'] });

export const eventsAfterQuerySchema = z.object({ after: z.coerce.number().int().min(0), limit: z.coerce.number().int().min(1).max(2000).default(500) });

export type DefinitionView = DefinitionSettings & {
  id: number; tankId: number; tankTag: string; label: string; unit: string; deadbandUnit: string;
  /** Limit in force now (band limits read live from the tank). */
  limit: number | null; updatedAt: string;
};

/** Tank, circuit and site are null for a plant-wide alarm (PLANT_ALARM_KINDS). */
export type AlarmView = {
  id: number; definitionId: number; kind: AlarmKind; label: string; priority: Priority; unit: string;
  tankId: number | null; tankTag: string | null; tankName: string | null; circuitId: number | null; circuitTag: string | null; siteTag: string | null;
  state: AlarmState; conditionActive: boolean;
  openedAt: string; activatedAt: string | null; unackSince: string | null; closedAt: string | null;
  ackedAt: string | null; ackedBy: string | null;
  shelvedUntil: string | null; shelvedReason: string | null; shelvedBy: string | null; oosReason: string | null; oosUntil: string | null;
  firstValue: number | null; limitValue: number | null; lastValue: number | null; lastValueAt: string | null;
  rationalisation: Rationalisation; lastEventId: number;
};

/** One alarm lifecycle event as screens get it (socket.io `alarm:event` and the events list). */
export const alarmEventViewSchema = z.object({
  id: z.number().int().positive(), instanceId: z.number().int(), definitionId: z.number().int(),
  /** null for a plant-wide alarm. */
  tankId: z.number().int().nullable(), tankTag: z.string().nullable(), siteTag: z.string().nullable(),
  alarmKind: z.enum(ALARM_KINDS), priority: z.literal(PRIORITIES), kind: z.string(),
  fromState: z.enum(ALARM_STATES), toState: z.enum(ALARM_STATES),
  conditionActive: z.boolean(), at: z.string(), byUserId: z.number().int().nullable(), byName: z.string().nullable(), how: z.enum(ALARM_HOW),
  comment: z.string().nullable(), value: z.number().nullable(), limit: z.number().nullable(),
});
export type AlarmEventView = z.infer<typeof alarmEventViewSchema>;

export type ActiveAlarmsResponse = { alarms: AlarmView[]; lastEventId: number; serverTime: string };
export type AlarmSummary = { byPriority: Record<Priority, { total: number; unacknowledged: number }>; shelved: number; outOfService: number; suppressed: number; lastEventId: number };
