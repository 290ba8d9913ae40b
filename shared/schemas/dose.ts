import { z } from 'zod';
import { OXIDANTS, type OxidantId, type ReadingFlag } from '../redox/index.ts';
import type { CircuitProcess } from './plant.ts';

/** What the Dose advisor needs from the plant; the arithmetic itself runs in the browser with shared/redox. */
export type DoseInputs = {
  tankId: number;
  tankTag: string;
  volumeM3: number;
  band: { low: number; high: number; target: number | null };
  /** Geometric mean of low and high: the middle of the band on the log scale it is drawn on. */
  bandMiddle: number;
  latest: { ratio: number; ts: string; tempC: number; flag: ReadingFlag } | null;
  latestAssay: { id: number; sampledAt: string; feTotalGPerL: number } | null;
  /** Ratio ×/÷ this factor is the probe tolerance expressed on the ratio (null when unknown). */
  uncertaintyFactor: number | null;
  /** What the tank's circuit runs: the default oxidant follows it. */
  circuitProcess: CircuitProcess;
};

const oxidantIds = OXIDANTS.map((o) => o.id) as [OxidantId, ...OxidantId[]];

/** The advisor's form: everything can be overridden by the metallurgist. */
export const doseFormSchema = z.object({
  ratioNow: z.number({ message: 'Enter the present ratio' }).finite().positive('The present ratio must be above 0').max(1e4),
  ratioTarget: z.number({ message: 'Enter the target ratio' }).finite().positive('The target ratio must be above 0').max(1e4),
  volumeM3: z.number({ message: 'Enter the tank volume' }).finite().positive('Volume must be above 0').max(1e7),
  totalFeGPerL: z.number({ message: 'Enter total iron' }).finite().positive('Total Fe must be above 0').max(1000),
  oxidant: z.enum(oxidantIds, { message: 'Choose an oxidant' }),
  utilisation: z.number({ message: 'Enter the utilisation' }).finite().gt(0, 'Utilisation must be above 0 %').max(1, 'Utilisation is at most 100 %'),
  /** Optional: feed flow and its ratio, to hold the target against fresh feed. */
  feedFlowM3PerH: z.number().finite().min(0).max(1e6).optional(),
  feedRatio: z.number().finite().positive().max(1e4).optional(),
});
export type DoseForm = z.infer<typeof doseFormSchema>;
