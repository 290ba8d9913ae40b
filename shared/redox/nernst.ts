/**
 * Nernst equation for Fe³⁺ + e⁻ ⇌ Fe²⁺ (n = 1), potentials vs SHE:
 *   E_SHE = E_probe + E_ref(T)
 *   E_SHE = E°′(T) + (R·T/F)·ln(Fe³⁺/Fe²⁺),  E°′(T) = E°′25 + k·(T − 298.15 K)
 */
import {
  FARADAY_C_PER_MOL,
  GAS_CONSTANT_J_PER_MOL_K,
  KELVIN_OFFSET,
  MAX_ABS_LN_RATIO,
  MAX_ABS_LOG10_RATIO,
  ORP_LIMIT_MV,
  POTENTIAL_LIMIT_V,
  TEMP_COEFF_LIMIT_V_PER_K,
} from './constants';
import { requireInRange, requirePositive, requirePositiveInteger, requireTempC } from './guards';
import { referencePotentialV, referenceStatus, type ReferenceElectrode } from './reference-electrodes';

/**
 * Nernst slope R·T/(n·F).
 * @param tempC temperature, °C (T = tempC + 273.15 K)
 * @param n electrons transferred (1 for the iron couple)
 * @returns volts per natural-log unit of the ratio (≈ 0.025693 V at 25 °C, n = 1)
 */
export function nernstSlopeV(tempC: number, n = 1): number {
  requireTempC('tempC', tempC);
  requirePositiveInteger('n', n);
  return (GAS_CONSTANT_J_PER_MOL_K * (tempC + KELVIN_OFFSET)) / (n * FARADAY_C_PER_MOL);
}

/**
 * Potential change per tenfold change of ratio, (R·T/(n·F))·ln 10.
 * @returns mV per decade (≈ 59.159 mV at 25 °C, n = 1)
 */
export function mvPerDecade(tempC: number, n = 1): number {
  return nernstSlopeV(tempC, n) * Math.LN10 * 1000;
}

/**
 * Formal potential at temperature, E°′(T) = E°′25 + k·(T − 298.15 K).
 * @param formalPotentialV E°′ vs SHE at 25 °C, V
 * @param tempC temperature, °C
 * @param formalCoeffVPerK k, V/K (0 when not calibrated)
 * @returns E°′(T), V vs SHE
 */
export function formalPotentialAtV(formalPotentialV: number, tempC: number, formalCoeffVPerK = 0): number {
  requireInRange('formalPotentialV', formalPotentialV, -POTENTIAL_LIMIT_V, POTENTIAL_LIMIT_V, 'V');
  requireTempC('tempC', tempC);
  requireInRange('formalCoeffVPerK', formalCoeffVPerK, -TEMP_COEFF_LIMIT_V_PER_K, TEMP_COEFF_LIMIT_V_PER_K, 'V/K');
  // tempC − 25 equals T − 298.15 K exactly, without the rounding of a kelvin round-trip.
  return formalPotentialV + formalCoeffVPerK * (tempC - 25);
}

export type RedoxConditions = {
  tempC: number;
  reference: ReferenceElectrode;
  /** E°′ vs SHE at 25 °C, V. */
  formalPotentialV: number;
  /** Temperature coefficient of E°′, V/K; defaults to 0. */
  formalCoeffVPerK?: number;
  /** Accepted slope efficiency of the probe (1 = the full Nernst slope R·T/F); defaults to 1. */
  slopeEfficiency?: number;
};

/**
 * Quality of a converted reading, worst first: 'outside-range' (|log10 ratio| > 4),
 * 'reference-unusable' (reference electrode above its usable temperature, e.g. calomel above
 * about 70 °C), 'probe-suspect' (set where readings are stored: the probe failed its last check
 * and has not passed one or been replaced since), 'reference-extrapolated' (outside the
 * temperatures its source covers), 'ok'.
 */
export const READING_FLAGS = ['ok', 'outside-range', 'reference-extrapolated', 'reference-unusable', 'probe-suspect'] as const;
export type ReadingFlag = (typeof READING_FLAGS)[number];

/** Widest accepted slope efficiency: beyond ±50 % the probe is broken, not sluggish. */
export const SLOPE_EFFICIENCY_LIMITS = { min: 0.5, max: 1.5 } as const;

function slopeOf(input: RedoxConditions): number {
  return input.slopeEfficiency === undefined ? 1
    : requireInRange('slopeEfficiency', input.slopeEfficiency, SLOPE_EFFICIENCY_LIMITS.min, SLOPE_EFFICIENCY_LIMITS.max);
}

export type OrpToRatioResult = {
  /** Potential vs SHE, V. */
  ehV: number;
  /** Fe³⁺/Fe²⁺, finite and > 0. */
  ratio: number;
  /** Fe³⁺/(Fe³⁺ + Fe²⁺), 0…1. */
  ferricFraction: number;
  flag: ReadingFlag;
};

/**
 * Converts a probe reading into the Fe³⁺/Fe²⁺ ratio.
 * @param input.orpMv probe reading vs its reference electrode, mV
 * @param input.tempC solution temperature, °C
 * @returns ehV (V vs SHE), ratio, ferric fraction, and a flag (see ReadingFlag): 'outside-range'
 *   when |log10 ratio| > 4 (the ratio is then clamped to stay finite and > 0), else the
 *   reference electrode's status at tempC
 */
export function orpToRatio(input: RedoxConditions & { orpMv: number }): OrpToRatioResult {
  const orpMv = requireInRange('orpMv', input.orpMv, -ORP_LIMIT_MV, ORP_LIMIT_MV, 'mV');
  const ehV = orpMv / 1000 + referencePotentialV(input.reference, input.tempC);
  const e0V = formalPotentialAtV(input.formalPotentialV, input.tempC, input.formalCoeffVPerK ?? 0);
  const lnRatio = (ehV - e0V) / (slopeOf(input) * nernstSlopeV(input.tempC));
  // Clamp rather than throw: an extreme reading is real data (fouled or dry probe)
  // that the floor must still display, flagged, without Infinity or 0 leaking out.
  const clamped = Math.max(-MAX_ABS_LN_RATIO, Math.min(MAX_ABS_LN_RATIO, lnRatio));
  const ratio = Math.exp(clamped);
  const outside = Math.abs(lnRatio) > MAX_ABS_LOG10_RATIO * Math.LN10;
  const refStatus = referenceStatus(input.reference, input.tempC);
  const flag: ReadingFlag = outside ? 'outside-range' : refStatus === 'ok' ? 'ok' : `reference-${refStatus}`;
  return { ehV, ratio, ferricFraction: ferricFractionOf(ratio), flag };
}

/**
 * Probe reading that corresponds to a ratio: the exact inverse of orpToRatio
 * (used to show ratio bands in mV at the current temperature).
 * @param input.ratio Fe³⁺/Fe²⁺, > 0
 * @returns probe reading vs the given reference electrode, mV
 */
export function ratioToOrpMv(input: RedoxConditions & { ratio: number }): number {
  const ratio = requirePositive('ratio', input.ratio);
  const e0V = formalPotentialAtV(input.formalPotentialV, input.tempC, input.formalCoeffVPerK ?? 0);
  const ehV = e0V + slopeOf(input) * nernstSlopeV(input.tempC) * Math.log(ratio);
  return (ehV - referencePotentialV(input.reference, input.tempC)) * 1000;
}

/**
 * Ferric fraction f = r/(1 + r).
 * @param ratio Fe³⁺/Fe²⁺, > 0
 * @returns 0…1
 */
export function ferricFractionOf(ratio: number): number {
  requirePositive('ratio', ratio);
  // Cannot overflow: for r up to Number.MAX_VALUE, 1 + r rounds to r, never Infinity.
  return ratio / (1 + ratio);
}
