import { z } from 'zod';
import { reasonSchema } from './workbench.ts';

const ratio = (what: string) =>
  z.number({ message: `Enter the ${what} ratio as a number` }).finite().positive(`The ${what} ratio must be above 0`).max(1e4, `The ${what} ratio must be at most 10 000`);

/** Band values and the rules between them: low > 0, high > low, target inside the band. */
export const bandValuesSchema = z
  .object({ low: ratio('low'), high: ratio('high'), target: ratio('target').nullable().default(null) })
  .superRefine((v, ctx) => {
    if (!(v.high > v.low)) ctx.addIssue({ code: 'custom', path: ['high'], message: 'High must be above low' });
    if (v.target != null && (v.target < v.low || v.target > v.high)) {
      ctx.addIssue({ code: 'custom', path: ['target'], message: 'Target must lie within the band (low ≤ target ≤ high)' });
    }
  });
export type BandValues = z.infer<typeof bandValuesSchema>;

export const bandChangeSchema = z
  .object({ low: ratio('low'), high: ratio('high'), target: ratio('target').nullable().default(null), reason: reasonSchema })
  .superRefine((v, ctx) => {
    const r = bandValuesSchema.safeParse({ low: v.low, high: v.high, target: v.target });
    if (!r.success) for (const i of r.error.issues) ctx.addIssue({ code: 'custom', path: i.path, message: i.message });
  });
export type BandChangeInput = z.infer<typeof bandChangeSchema>;

export const bandCopySchema = z.object({
  tankIds: z.array(z.number().int().positive()).min(1, 'Choose at least one tank').max(50),
  reason: reasonSchema,
});
export type BandCopyInput = z.infer<typeof bandCopySchema>;

export const bandDecisionSchema = z.object({ note: z.string().trim().max(500).optional() });
export const bandRejectSchema = z.object({ note: reasonSchema });

export const BAND_CHANGE_STATUSES = ['applied', 'pending', 'approved', 'rejected', 'withdrawn'] as const;
export type BandChangeStatus = (typeof BAND_CHANGE_STATUSES)[number];

export const bandChangesQuerySchema = z.object({
  tankId: z.coerce.number().int().positive().optional(),
  status: z.enum(BAND_CHANGE_STATUSES).optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
});
export type BandChangesQuery = z.infer<typeof bandChangesQuerySchema>;

export type BandChange = {
  id: number;
  tankId: number;
  tankTag: string;
  old: BandValues;
  new: BandValues;
  reason: string;
  requestedBy: { id: number; name: string };
  requestedAt: string;
  needsApproval: boolean;
  copiedFromTankId: number | null;
  /** Set when earlier changes in the approval window add up with this one: the band it was judged against. */
  cumulativeFrom: { band: BandValues; since: string } | null;
  status: BandChangeStatus;
  decision: { by: { id: number; name: string }; at: string; note: string | null } | null;
};

/** True when either bound moves by more than `factor` (up or down): such a change needs a second person. */
export function isLargeBandChange(old: BandValues, next: BandValues, factor: number): boolean {
  const move = (a: number, b: number) => Math.max(a / b, b / a);
  return move(old.low, next.low) > factor || move(old.high, next.high) > factor;
}

/** What converts a ratio to probe mV for this tank now (fed to shared/redox ratioToOrpMv). */
export type MvConditions = {
  tempC: number;
  reference: { id: string; label: string; e25V: number; coeffVPerK: number; source: string };
  formalPotentialV: number;
  formalCoeffVPerK: number;
};

/** A band as probe mV at the tank's current temperature, with what it was computed from. */
export type BandMvView = {
  lowMv: number; highMv: number; targetMv: number | null; tempC: number; referenceLabel: string; calibrationVersion: number;
  conditions: MvConditions;
};

export type BandRow = {
  tankId: number;
  tankTag: string;
  tankName: string;
  circuitId: number;
  circuitTag: string;
  /** As the Floor names it, e.g. "Train A · bioleach". */
  circuitName: string;
  siteId: number;
  band: BandValues;
  mv: BandMvView | null;
  /** Why mv is null (no probe, no reading yet, no calibration, …). */
  mvNote: string | null;
  pending: BandChange | null;
};

export type BandsResponse = { tanks: BandRow[]; approvalFactor: Record<number, number> };
