import { z } from 'zod';
import { instantSchema, reasonSchema } from './workbench.ts';

/** Slope efficiency outside this range earns a warning (probe fouled, sluggish, or a mixed potential). */
export const SLOPE_EFFICIENCY_OK = { min: 0.9, max: 1.05 } as const;

/** Longest period one recompute may rewrite, so a request cannot lock the readings table for long. */
export const RECOMPUTE_MAX_DAYS = 31;

const windowShape = {
  from: instantSchema,
  to: instantSchema,
  excluded: z
    .array(z.object({ assayId: z.number().int().positive(), reason: reasonSchema }))
    .max(1000)
    .default([]),
};
const windowOrder = (v: { from: string; to: string }) => Date.parse(v.from) < Date.parse(v.to);

export const calibrationFitSchema = z.object(windowShape).refine(windowOrder, { message: 'From must be before to', path: ['from'] });
export type CalibrationFitInput = z.infer<typeof calibrationFitSchema>;

export const calibrationApplySchema = z
  .object({
    ...windowShape,
    reason: reasonSchema,
    /** E°′25 the user saw; the server refits and refuses when the assays changed in between. */
    expectedFormalPotentialV: z.number().finite(),
  })
  .refine(windowOrder, { message: 'From must be before to', path: ['from'] });
export type CalibrationApplyInput = z.infer<typeof calibrationApplySchema>;

export const recomputeSchema = z
  .object({ version: z.number().int().positive(), from: instantSchema, to: instantSchema, reason: reasonSchema })
  .refine(windowOrder, { message: 'From must be before to', path: ['from'] })
  .refine((v) => Date.parse(v.to) - Date.parse(v.from) <= RECOMPUTE_MAX_DAYS * 86_400_000, {
    message: `At most ${RECOMPUTE_MAX_DAYS} days at a time`, path: ['to'],
  });
export type RecomputeInput = z.infer<typeof recomputeSchema>;

export type FitPoint = {
  assayId: number;
  sampledAt: string;
  labRatio: number;
  orpMv: number;
  tempC: number;
  /** Measured minus fitted probe reading, mV. */
  residualMv: number;
  /** Measured minus the reading the calibration in force predicts, mV (null without one). */
  currentResidualMv: number | null;
};

export type CalibrationVersion = {
  version: number;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  validFrom: string;
  reason: string;
  createdBy: { id: number; name: string } | null;
  fit: { n: number; rmsMv: number; slopeEfficiency: number | null; from: string; to: string } | null;
};

export type FitResult = {
  tankId: number;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  fittedTempCoeff: boolean;
  /** Why k was or was not fitted, in words. */
  tempCoeffNote: string;
  tempSpanC: number;
  meanTempC: number;
  n: number;
  rmsMv: number;
  slopeEfficiency: number | null;
  slopeWarning: string | null;
  points: FitPoint[];
  /** Assays in the window that could not be used, with the reason. */
  skipped: Array<{ assayId: number; sampledAt: string; reason: string }>;
  excluded: Array<{ assayId: number; reason: string }>;
  current: {
    version: number;
    formalPotentialV: number;
    formalCoeffVPerK: number;
    rmsMv: number | null;
    /** New minus current E°′ at the assays' mean temperature, mV. */
    shiftMv: number;
  } | null;
};

export type CalibrationOverview = {
  tankId: number;
  tankTag: string;
  probe: { id: number; tag: string; referenceLabel: string; referenceE25V: number; referenceCoeffVPerK: number; toleranceMv: number } | null;
  inForce: CalibrationVersion | null;
  versions: CalibrationVersion[];
  minTempSpanC: number;
};

export type ApplyResult = { calibration: CalibrationVersion; fit: FitResult };
export type RecomputeResult = { version: number; updated: number; from: string; to: string };
