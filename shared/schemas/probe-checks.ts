import { z } from 'zod';
import { instantSchema, reasonSchema } from './workbench.ts';

export const STANDARDS = ['zobell', 'light'] as const;
export const STANDARD_LABELS: Record<(typeof STANDARDS)[number], string> = {
  zobell: "ZoBell's solution",
  light: "Light's solution",
};

export const probeCheckSchema = z.object({
  probeId: z.number({ message: 'Choose a probe' }).int().positive('Choose a probe'),
  standard: z.enum(STANDARDS, { message: "Choose ZoBell's or Light's solution" }),
  tempC: z.number({ message: 'Enter the standard temperature' }).finite().min(-10).max(150),
  readingMv: z.number({ message: 'Enter the reading in mV' }).finite().min(-5000).max(5000),
  /** Defaults to the probe's own tolerance. */
  toleranceMv: z.number().finite().positive('Tolerance must be above 0').max(1000).optional(),
  checkedAt: instantSchema.optional(),
  note: z.string().trim().max(500).optional(),
});
export type ProbeCheckInput = z.infer<typeof probeCheckSchema>;

export const probeChecksQuerySchema = z.object({
  probeId: z.coerce.number().int().positive().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});

export const checkIntervalSchema = z.object({
  intervalDays: z.number({ message: 'Enter the interval in days' }).finite().min(0.5, 'At least half a day').max(365, 'At most 365 days'),
  reason: reasonSchema,
});

export const REPLACED_PARTS = ['whole', 'reference', 'sensing'] as const;
export const REPLACED_PART_LABELS: Record<(typeof REPLACED_PARTS)[number], string> = {
  whole: 'Whole probe',
  reference: 'Reference electrode / electrolyte',
  sensing: 'Sensing element (Pt)',
};

export const probeReplacementSchema = z.object({
  probeId: z.number({ message: 'Choose a probe' }).int().positive('Choose a probe'),
  part: z.enum(REPLACED_PARTS, { message: 'Choose what was replaced' }),
  replacedAt: instantSchema,
  reason: reasonSchema,
  note: z.string().trim().max(500).optional(),
});
export type ProbeReplacementInput = z.infer<typeof probeReplacementSchema>;

export type ProbeCheckRow = {
  id: number;
  probeId: number;
  probeTag: string;
  standard: (typeof STANDARDS)[number];
  tempC: number;
  readingMv: number;
  toleranceMv: number;
  expectedMv: number;
  errorMv: number;
  pass: boolean;
  checkedAt: string;
  checkedBy: { id: number; name: string };
  note: string | null;
};

export type ProbeDue = {
  probeId: number;
  probeTag: string;
  tankId: number;
  tankTag: string;
  intervalDays: number;
  lastCheck: { at: string; pass: boolean; errorMv: number } | null;
  lastReplacementAt: string | null;
  dueAt: string;
  overdue: boolean;
  /** Why the probe is due when: interval since the last pass, a failed check, or a replacement. */
  basis: 'last-pass' | 'failed-check' | 'replacement' | 'installation';
};

export type ProbeReplacementRow = {
  id: number;
  probeId: number;
  probeTag: string;
  part: (typeof REPLACED_PARTS)[number];
  replacedAt: string;
  reason: string;
  note: string | null;
  createdBy: { id: number; name: string };
};
