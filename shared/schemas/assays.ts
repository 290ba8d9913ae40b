import { z } from 'zod';
import { IRON_MOLAR_MASS_G_PER_MOL } from '../redox/index.ts';
import { FUTURE_SKEW_MS, instantSchema, reasonSchema } from './workbench.ts';

export const ASSAY_UNITS = ['g/L', 'mg/L', 'mol/L'] as const;
export type AssayUnit = (typeof ASSAY_UNITS)[number];

/** Concentration in the entered unit → g/L (mol/L through the molar mass of iron). */
export function toGramsPerLitre(value: number, unit: AssayUnit): number {
  if (unit === 'mg/L') return value / 1000;
  if (unit === 'mol/L') return value * IRON_MOLAR_MASS_G_PER_MOL;
  return value;
}

/** Case-insensitive unit lookup for CSV cells; null when the unit is not one we know. */
export function parseAssayUnit(text: string): AssayUnit | null {
  const t = text.trim().toLowerCase();
  return ASSAY_UNITS.find((u) => u.toLowerCase() === t) ?? null;
}

const conc = (what: string) =>
  z.number({ message: `Enter ${what} as a number` }).finite().min(0, `${what} cannot be negative`).max(1e6, `${what} is implausibly large`);
const optText = (max: number) => z.string().trim().max(max, `At most ${max} characters`).optional().transform((v) => (v ? v : undefined));

export const assayEntrySchema = z
  .object({
    tankId: z.number({ message: 'Choose a tank' }).int().positive('Choose a tank'),
    sampledAt: instantSchema,
    fe2: conc('Fe²⁺'),
    feTotal: conc('Total Fe').refine((v) => v > 0, 'Total Fe must be above 0'),
    unit: z.enum(ASSAY_UNITS, { message: 'Choose g/L, mg/L or mol/L' }),
    method: optText(80),
    analyst: optText(80),
    labRef: optText(60),
    note: optText(500),
  })
  .superRefine((v, ctx) => {
    if (v.fe2 > v.feTotal) ctx.addIssue({ code: 'custom', path: ['fe2'], message: 'Fe²⁺ cannot be above total Fe' });
    if (Date.parse(v.sampledAt) > Date.now() + FUTURE_SKEW_MS) {
      ctx.addIssue({ code: 'custom', path: ['sampledAt'], message: 'Sampling time is in the future' });
    }
  });
export type AssayEntryInput = z.infer<typeof assayEntrySchema>;

export const assayRetractSchema = z.object({ reason: reasonSchema });

export const assaysQuerySchema = z.object({
  tankId: z.coerce.number().int().positive().optional(),
  from: instantSchema.optional(),
  to: instantSchema.optional(),
  includeRetracted: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  limit: z.coerce.number().int().min(1).max(2000).default(200),
});
export type AssaysQuery = z.infer<typeof assaysQuerySchema>;

/** An assay paired with the tank's probe readings around its sampling time. */
export type AssayMatch = {
  /** Readings averaged (0 when none fell in the window). */
  n: number;
  probeId: number | null;
  orpMv: number | null;
  tempC: number | null;
  /** exp(mean ln ratio) of the matched readings. */
  probeRatio: number | null;
  /** Probe minus lab, in mV at the readings' mean temperature (positive: the probe reads high). */
  diffMv: number | null;
  calibrationVersion: number | null;
};

export type Assay = {
  id: number;
  tankId: number;
  tankTag: string;
  sampledAt: string;
  fe2GPerL: number;
  feTotalGPerL: number;
  unit: AssayUnit;
  fe2Entered: number;
  feTotalEntered: number;
  /** (total − Fe²⁺)/Fe²⁺; null when Fe²⁺ is 0 or equals total Fe (no finite, positive ratio). */
  labRatio: number | null;
  method: string | null;
  analyst: string | null;
  labRef: string | null;
  note: string | null;
  source: string;
  createdBy: { id: number; name: string };
  createdAt: string;
  retracted: { at: string; by: number; reason: string } | null;
  match: AssayMatch;
};
export type AssaysResponse = { assays: Assay[]; windowMin: number };

/** CSV columns: required first. Times with Z or an offset are UTC-exact; bare times are site time. */
export const ASSAY_CSV_REQUIRED = ['tank', 'sampled_at', 'fe2', 'fe_total', 'unit'] as const;
export const ASSAY_CSV_OPTIONAL = ['method', 'analyst', 'lab_ref', 'note'] as const;
export const ASSAY_CSV_MAX_BYTES = 5 * 1024 * 1024;
export const ASSAY_CSV_MAX_ROWS = 20_000;

export type CsvRowError = { row: number; column: string; value: string; message: string };
export type CsvPreviewRow = {
  row: number; tankTag: string; sampledAt: string; fe2: number; feTotal: number; unit: AssayUnit;
  fe2GPerL: number; feTotalGPerL: number; method: string | null; analyst: string | null; labRef: string | null; note: string | null;
};
export type CsvPreview = {
  fileName: string;
  delimiter: ',' | ';' | '\t';
  decimalComma: boolean;
  bom: boolean;
  rowCount: number;
  validCount: number;
  errors: CsvRowError[];
  /** True when more errors exist than are listed. */
  errorsTruncated: boolean;
  /** The first valid rows, for the preview table. */
  sample: CsvPreviewRow[];
};
export type CsvCommitResult = { inserted: number; fileName: string };
