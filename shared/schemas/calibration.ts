import { z } from 'zod';
import { SLOPE_EFFICIENCY_LIMITS } from '../redox/index.ts';
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
  /** Slope efficiency to fit with and store (the fitted one, once accepted); 1 when not given. */
  slopeEfficiency: z.number().min(SLOPE_EFFICIENCY_LIMITS.min).max(SLOPE_EFFICIENCY_LIMITS.max).default(1),
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
  /** Externally studentized residual (null with fewer than 5 assays). */
  studentizedResidual: number | null;
  /** |studentized residual| > 3: a likely gross assay or matching error. */
  suspect: boolean;
  /** (R·T/F)·ln(lab ratio), V: the x of the E_SHE plot. */
  nernstTermV: number;
  /** Probe reading vs SHE, V. */
  eSheV: number;
  /** E°′ this assay alone gives at its own temperature, V. */
  pointFormalPotentialV: number;
};

export type CalibrationVersion = {
  version: number;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  /** Accepted slope efficiency the conversion uses (1 = the full Nernst slope). */
  slopeEfficiency: number;
  validFrom: string;
  reason: string;
  createdBy: { id: number; name: string } | null;
  fit: { n: number; rmsMv: number; slopeEfficiency: number | null; from: string; to: string } | null;
};

export type FitResult = {
  tankId: number;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  /** Slope efficiency this fit assumed (and an apply stores). */
  usedSlopeEfficiency: number;
  fittedTempCoeff: boolean;
  tempCoeffBasis: 'fitted' | 'held' | 'held-narrow-span' | 'held-too-few-assays' | 'default-zero';
  /** Why k was or was not fitted, in words. */
  tempCoeffNote: string;
  tempSpanC: number;
  meanTempC: number;
  n: number;
  rmsMv: number;
  slopeEfficiency: number | null;
  slopeWarning: string | null;
  /** OLS standard errors, V and V/K (k's is null when k was held). */
  standardErrors: { formalPotentialV: number; formalCoeffVPerK: number | null };
  /** E°′ at the assays' mean temperature with its standard error, V. */
  atMeanTemp: { tempC: number; formalPotentialV: number; standardErrorV: number };
  /** The joint fit behind the slope efficiency (null unless the lab ratios span a decade). */
  slopeFit: { slopeEfficiency: number; standardError: number; formalPotentialV: number; formalCoeffVPerK: number; jointTempCoeff: boolean } | null;
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
