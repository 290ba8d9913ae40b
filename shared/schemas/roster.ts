import { z } from 'zod';
import { emailSchema } from './auth.ts';

/** Call roster shifts and escalation policy: used by the API and the Call roster forms. */
export const ON_CALL_ROLES = ['primary', 'backup', 'supervisor'] as const;
export type OnCallRole = (typeof ON_CALL_ROLES)[number];
export const ON_CALL_LABEL: Record<OnCallRole, string> = { primary: 'First call', backup: 'Backup', supervisor: 'Shift supervisor' };

const personName = z.string().trim().min(1, 'Enter a name').max(120);
const iso = z.iso.datetime({ offset: true, message: 'Use a date and time with a time zone' });
const MAX_SHIFT_MS = 7 * 86_400_000;

export const shiftSchema = z
  .object({
    personName,
    email: emailSchema,
    roleOnCall: z.enum(ON_CALL_ROLES),
    startsAt: iso,
    endsAt: iso,
    note: z.string().trim().max(300).optional(),
  })
  .refine((v) => Date.parse(v.endsAt) > Date.parse(v.startsAt), { message: 'The shift must end after it starts', path: ['endsAt'] })
  .refine((v) => Date.parse(v.endsAt) - Date.parse(v.startsAt) <= MAX_SHIFT_MS, { message: 'A shift is at most 7 days', path: ['endsAt'] });
export type ShiftInput = z.infer<typeof shiftSchema>;

export const removeShiftSchema = z.object({ reason: z.string().trim().min(3, 'Give a reason').max(500) });

/** A rotation: people take turns, one shift each, back to back from startsAt. */
export const rotationSchema = z.object({
  people: z.array(z.object({ personName, email: emailSchema })).min(1).max(20),
  roleOnCall: z.enum(ON_CALL_ROLES),
  startsAt: iso,
  shiftHours: z.number().int().min(1).max(168),
  count: z.number().int().min(1).max(120),
});
export type RotationInput = z.infer<typeof rotationSchema>;

export const shiftsQuerySchema = z.object({ from: iso, to: iso }).refine((v) => Date.parse(v.from) < Date.parse(v.to), { message: 'from must be before to', path: ['from'] });

export const escalationStepSchema = z.object({
  afterMin: z.number().int().min(1, 'At least 1 minute').max(24 * 60),
  notify: z.array(z.enum(ON_CALL_ROLES)).min(1, 'Pick whom to notify').max(3),
});
/** The whole policy of one priority, replaced at once (steps in time order). */
export const policySchema = z.object({
  priority: z.number().int().min(1).max(3),
  steps: z.array(escalationStepSchema).max(5)
    .refine((s) => s.every((x, i) => i === 0 || x.afterMin > s[i - 1].afterMin), 'Each step must come later than the one before'),
  reason: z.string().trim().min(3, 'Give a reason').max(500),
});
export type PolicyInput = z.infer<typeof policySchema>;

export type OnCallShiftView = { id: number; personName: string; email: string; roleOnCall: OnCallRole; startsAt: string; endsAt: string; note: string | null; userId: number | null };
export type EscalationStepView = { priority: number; step: number; afterMin: number; notify: OnCallRole[] };
export type OnCallNow = { at: string; shifts: OnCallShiftView[] };
