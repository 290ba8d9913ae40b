/**
 * Working with a ratio once it is known: splitting total iron, log scale for
 * bands and charts, and how far a probe tolerance moves the ratio.
 */
import { TOLERANCE_LIMIT_MV } from './constants';
import { requireFinite, requireNonNegative, requirePositive, requireTempC } from './guards';
import { ferricFractionOf, nernstSlopeV } from './nernst';

/**
 * Splits total iron into Fe³⁺ and Fe²⁺ from the ratio.
 * @param ratio Fe³⁺/Fe²⁺, > 0
 * @param totalFe total iron in any concentration unit (g/L usually), ≥ 0
 * @returns fe3 and fe2 in the unit of totalFe; fe3 + fe2 = totalFe (to rounding)
 */
export function ironSplit(ratio: number, totalFe: number): { fe3: number; fe2: number } {
  requirePositive('ratio', ratio);
  requireNonNegative('totalFe', totalFe);
  // Each part from its own fraction: totalFe·ratio could overflow, and a
  // subtraction would lose the minor ion's digits at extreme ratios.
  return { fe3: totalFe * ferricFractionOf(ratio), fe2: totalFe / (1 + ratio) };
}

/**
 * log10 of a ratio, for log-scaled bands and trend axes.
 * @param ratio Fe³⁺/Fe²⁺, > 0
 */
export function log10Ratio(ratio: number): number {
  requirePositive('ratio', ratio);
  return Math.log10(ratio);
}

/**
 * Ratio from its log10 (inverse of log10Ratio), clamped like orpToRatio so it stays finite.
 * @param log10 log10 of Fe³⁺/Fe²⁺, finite
 */
export function ratioFromLog10(log10: number): number {
  // 10^±300 keeps the ratio inside the double range with room to spare.
  const v = requireFinite('log10', log10);
  return 10 ** Math.max(-300, Math.min(300, v));
}

/**
 * How far the ratio may be off when the potential is uncertain by ±toleranceMv:
 * d(ln ratio) = dE·F/(R·T), so the ratio is uncertain by a factor exp(tol/(R·T/F)).
 * @param input.tempC temperature, °C
 * @param input.toleranceMv potential tolerance, mV, in (0, 1000]
 * @returns factor ≥ 1; the true ratio lies within ratio/factor … ratio·factor (≈1.48 for ±10 mV at 25 °C)
 */
export function ratioUncertainty(input: { tempC: number; toleranceMv: number }): { factor: number } {
  requireTempC('tempC', input.tempC);
  const toleranceMv = requirePositive('toleranceMv', input.toleranceMv, TOLERANCE_LIMIT_MV, 'mV');
  return { factor: Math.exp(toleranceMv / 1000 / nernstSlopeV(input.tempC)) };
}
