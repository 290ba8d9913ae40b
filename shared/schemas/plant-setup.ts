import { z } from 'zod';
import { LIGHT_SOLUTION } from '../redox/standards';
import { emailSchema, passwordSchema } from './auth.ts';
import type { GatewayLive } from './ingest-health.ts';
import type { DeadLetterKind } from './dead-letters.ts';
import type { CircuitProcess } from './plant.ts';

/** Plant setup: sites, circuits, tanks, probes and gateways (README "Setting up a site"). */

const tag = z.string().trim().regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{0,39}$/, 'Use 1–40 letters, digits, _ . or -, starting with a letter or digit');
const name = z.string().trim().min(1, 'Enter a name').max(120, 'At most 120 characters');
const id = z.coerce.number().int().positive();
/** Why a change was made; required on every edit and retirement (audit trail). */
export const reasonSchema = z.string().trim().min(3, 'Say why, in a few words').max(500, 'At most 500 characters');
const optionalReason = z.string().trim().max(500, 'At most 500 characters').optional();

const timeZone = z.string().trim().min(1, 'Enter a time zone').refine((tz) => {
  try {
    new Intl.DateTimeFormat('en', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}, 'Not a known IANA time zone (e.g. Australia/Perth, UTC)');

export const siteInputSchema = z.object({ tag, name, timeZone, reason: optionalReason });
export const siteUpdateSchema = z.object({ name: name.optional(), timeZone: timeZone.optional(), reason: reasonSchema });

/** What a circuit runs (circuits.process; the Dose advisor's default oxidant follows it). */
export const CIRCUIT_PROCESSES = ['bioleach', 'ferric-leach', 'other'] as const satisfies readonly CircuitProcess[];
export const CIRCUIT_PROCESS_LABELS: Record<CircuitProcess, string> = { bioleach: 'Bioleach', 'ferric-leach': 'Ferric leach', other: 'Other' };
const order = z.coerce.number({ message: 'Enter a whole number' }).int('Enter a whole number').min(1, 'Counted from 1').max(999);
export const circuitInputSchema = z.object({
  siteId: id, tag, name, process: z.enum(CIRCUIT_PROCESSES, { message: 'Pick what the circuit runs' }), position: order, reason: optionalReason,
});
export const circuitUpdateSchema = z.object({
  name: name.optional(), process: z.enum(CIRCUIT_PROCESSES).optional(), position: order.optional(), reason: reasonSchema,
});

/** The starting formal potential a new tank gets until its first assay calibration. */
export const STARTING_FORMAL_POTENTIAL = {
  valueV: LIGHT_SOLUTION.ehV,
  source: "Fe³⁺/Fe²⁺ 1:1 in about 1 M H₂SO₄ (Light's solution, Standard Methods 2580): a common starting point until the first assay calibration",
} as const;

const positive = (what: string, max: number) =>
  z.coerce.number({ message: `Enter ${what}` }).finite().positive(`${what} must be more than 0`).max(max, `${what} must be at most ${max}`);
const tankFields = {
  name, position: order,
  volumeM3: positive('the working volume', 100_000),
  feTotalGPerL: positive('the usual total iron', 200).nullable().optional(),
};
export const tankInputSchema = z
  .object({
    circuitId: id, tag, ...tankFields,
    bandLow: positive('the band low', 1e6), bandHigh: positive('the band high', 1e6),
    formalPotentialV: z.coerce.number({ message: 'Enter a potential in V' }).min(0.3, 'Between 0.3 and 1.0 V').max(1.0, 'Between 0.3 and 1.0 V'),
    reason: optionalReason,
  })
  .refine((v) => v.bandLow < v.bandHigh, { message: 'The band low must be below the band high', path: ['bandLow'] });
export const tankUpdateSchema = z.object({
  name: tankFields.name.optional(), position: order.optional(), volumeM3: tankFields.volumeM3.optional(),
  feTotalGPerL: tankFields.feTotalGPerL, reason: reasonSchema,
});

export const CUSTOM_REFERENCE = 'custom';
const probeFields = {
  referenceId: z.string().trim().min(1, 'Pick a reference electrode').max(20),
  /** Only for a custom reference: its potential vs SHE at 25 °C and temperature coefficient. */
  referenceE25V: z.coerce.number().min(-0.5, 'Between −0.5 and 1.0 V').max(1.0, 'Between −0.5 and 1.0 V').optional(),
  referenceCoeffVPerK: z.coerce.number().min(-0.005, 'Between −5 and 5 mV/K').max(0.005, 'Between −5 and 5 mV/K').optional(),
  toleranceMv: z.coerce.number({ message: 'Enter a tolerance in mV' }).positive('More than 0 mV').max(100, 'At most 100 mV'),
  intervalS: z.coerce.number({ message: 'Enter an interval in s' }).min(0.1, 'At least 0.1 s').max(3600, 'At most 3600 s'),
  installedAt: z.iso.datetime({ offset: true, message: 'Enter the date and time it was installed' }),
};
const customNeedsValues = (v: { referenceId?: string; referenceE25V?: number; referenceCoeffVPerK?: number }) =>
  v.referenceId !== CUSTOM_REFERENCE || (v.referenceE25V !== undefined && v.referenceCoeffVPerK !== undefined);
const customMessage = { message: 'A custom reference needs its potential at 25 °C and its coefficient', path: ['referenceE25V'] };
export const probeInputSchema = z.object({ tankId: id, tag, ...probeFields, reason: optionalReason }).refine(customNeedsValues, customMessage);
export const probeUpdateSchema = z
  .object({
    referenceId: probeFields.referenceId.optional(), referenceE25V: probeFields.referenceE25V, referenceCoeffVPerK: probeFields.referenceCoeffVPerK,
    toleranceMv: probeFields.toleranceMv.optional(), intervalS: probeFields.intervalS.optional(), reason: reasonSchema,
  })
  .refine(customNeedsValues, customMessage);

const username = z.string().regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{2,63}$/, 'Use 3–64 letters, digits, _ . or -, starting with a letter or digit');
export const gatewayInputSchema = z.object({ username, name: name.optional(), siteId: id, reason: optionalReason });
export const gatewayUpdateSchema = z.object({ name: name.optional(), enabled: z.boolean().optional(), reason: reasonSchema });
export const retireSchema = z.object({ reason: reasonSchema });

export type SiteInput = z.infer<typeof siteInputSchema>;
export type SiteUpdate = z.infer<typeof siteUpdateSchema>;
export type CircuitInput = z.infer<typeof circuitInputSchema>;
export type CircuitUpdate = z.infer<typeof circuitUpdateSchema>;
export type TankInput = z.infer<typeof tankInputSchema>;
export type TankUpdate = z.infer<typeof tankUpdateSchema>;
export type ProbeInput = z.infer<typeof probeInputSchema>;
export type ProbeUpdate = z.infer<typeof probeUpdateSchema>;
export type GatewayInput = z.infer<typeof gatewayInputSchema>;
export type GatewayUpdate = z.infer<typeof gatewayUpdateSchema>;

export type SetupSite = { id: number; tag: string; name: string; timeZone: string; retiredAt: string | null };
export type SetupCircuit = { id: number; siteId: number; tag: string; name: string; process: CircuitProcess; position: number; retiredAt: string | null };
export type SetupTank = {
  id: number; circuitId: number; tag: string; name: string; position: number; volumeM3: number;
  feTotalGPerL: number | null; retiredAt: string | null;
};
export type SetupProbe = {
  id: number; tankId: number; tag: string; referenceId: string; referenceE25V: number; referenceCoeffVPerK: number;
  toleranceMv: number; intervalS: number; installedAt: string; retiredAt: string | null;
  replacements: Array<{ part: string; replacedAt: string; reason: string }>;
};
export type SetupGateway = {
  id: number; siteId: number; username: string; name: string | null; enabled: boolean; retiredAt: string | null;
  /** From the broker; null when it has not reported (e.g. a site's own broker). */
  live: GatewayLive | null;
  deadLettersByKind: Partial<Record<DeadLetterKind, number>>;
};
export type PlantSetup = { sites: SetupSite[]; circuits: SetupCircuit[]; tanks: SetupTank[]; probes: SetupProbe[]; gateways: SetupGateway[] };
/** A new or rotated gateway password: shown once, never stored in clear. */
export type GatewaySecret = { gateway: SetupGateway; password: string };

/** First run: the one-time set-up link creates the first admin of an empty database. */
export const firstRunSchema = z.object({
  token: z.string().trim().min(20, 'The set-up link is incomplete').max(200),
  email: emailSchema,
  name: z.string().trim().min(1, 'Enter a name').max(120),
  password: passwordSchema,
});
export type FirstRunInput = z.infer<typeof firstRunSchema>;
