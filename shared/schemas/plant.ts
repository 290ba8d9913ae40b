import { z } from 'zod';
import type { TankLive } from './readings.ts';

export type Band = { low: number; high: number; target: number | null };

export type ProbeInfo = {
  id: number;
  tag: string;
  referenceId: string;
  referenceLabel: string;
  referenceE25V: number;
  referenceCoeffVPerK: number;
  toleranceMv: number;
  intervalS: number;
  installedAt: string;
};

export type CalibrationInfo = {
  version: number;
  formalPotentialV: number;
  formalCoeffVPerK: number;
  /** Accepted slope efficiency the conversion uses (1 = the full Nernst slope). */
  slopeEfficiency: number;
  validFrom: string;
  reason: string;
};

export type TankSummary = {
  id: number;
  tag: string;
  name: string;
  position: number;
  volumeM3: number;
  offline: boolean;
  band: Band;
  probe: ProbeInfo | null;
  calibration: CalibrationInfo | null;
  latest: TankLive | null;
};

/** One stored reading with the calibration version it was converted with (late readings keep the one valid at their time). */
export type RecentReading = { ts: string; orpMv: number; tempC: number; ratio: number; flag: 'ok' | 'outside-range'; calibrationVersion: number };

/** What a circuit runs: bioleach circuits are oxidised with air or oxygen (peroxide harms the culture). */
export type CircuitProcess = 'bioleach' | 'ferric-leach' | 'other';

export type CircuitSummary = { id: number; tag: string; name: string; position: number; process: CircuitProcess; tanks: TankSummary[] };
export type SiteSummary = { id: number; tag: string; name: string; timeZone: string; circuits: CircuitSummary[] };
export type PlantResponse = { sites: SiteSummary[]; serverTime: string };

/** Trend columns, ready for uPlot: t in seconds since epoch. */
export type TrendResponse = {
  tankId: number;
  resolution: 'raw' | '1m' | '1h';
  from: string;
  to: string;
  t: number[];
  ratio: number[];
  ratioMin: number[];
  ratioMax: number[];
  orpMv: number[];
  tempC: number[];
};

export const trendQuerySchema = z
  .object({
    from: z.iso.datetime({ offset: true }),
    to: z.iso.datetime({ offset: true }),
    maxPoints: z.coerce.number().int().min(10).max(10_000).default(2000),
  })
  .refine((v) => Date.parse(v.from) < Date.parse(v.to), { message: 'from must be before to', path: ['from'] });
export type TrendQuery = z.infer<typeof trendQuerySchema>;

export const idParamSchema = z.object({ id: z.coerce.number().int().positive() });
