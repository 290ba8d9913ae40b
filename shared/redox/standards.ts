/**
 * Probe checks against ORP standard solutions (Standard Methods for the
 * Examination of Water and Wastewater, method 2580).
 */
import { ORP_LIMIT_MV, TOLERANCE_LIMIT_MV } from './constants';
import { requireInRange, requireOneOf, requirePositive } from './guards';
import { referencePotentialV, type ReferenceElectrode } from './reference-electrodes';

export type StandardSolution = 'zobell' | 'light';

/**
 * ZoBell's solution (3.33 mM K₄Fe(CN)₆ + 3.33 mM K₃Fe(CN)₆ in 0.1 M KCl), Eh vs SHE
 * (Standard Methods for the Examination of Water and Wastewater, 2580, Table 2580:I).
 * Never acidify it: it releases hydrogen cyanide.
 */
export const ZOBELL_TABLE: ReadonlyArray<{ tempC: number; ehV: number }> = [
  { tempC: 1, ehV: 0.481 },
  { tempC: 5, ehV: 0.472 },
  { tempC: 10, ehV: 0.461 },
  { tempC: 15, ehV: 0.45 },
  { tempC: 20, ehV: 0.439 },
  { tempC: 25, ehV: 0.428 },
  { tempC: 30, ehV: 0.417 },
];

/**
 * Light's solution (0.1 M ferrous + 0.1 M ferric ammonium sulfate in about 1 M H₂SO₄).
 * The sources give 25 °C only. We accept 20–30 °C: a 1:1 Fe couple drifts by roughly
 * 1 mV/K, so up to ~5 mV of the tolerance may be temperature at the window edges.
 */
export const LIGHT_SOLUTION = {
  ehV: 0.675,
  tempMinC: 20,
  tempMaxC: 30,
  source: 'Standard Methods 2580; ASTM D1498: 0.675 V vs SHE at 25 °C',
} as const;

/**
 * Eh of a standard solution vs SHE at the given temperature.
 * ZoBell: linear interpolation in Table 2580:I, 1–30 °C. Light: 0.675 V, 20–30 °C.
 * @returns V vs SHE
 * @throws RangeError outside the solution's tabulated temperature range
 */
export function standardPotentialV(standard: StandardSolution, tempC: number): number {
  requireOneOf('standard', standard, ['zobell', 'light'] as const);
  if (standard === 'light') {
    requireInRange('tempC', tempC, LIGHT_SOLUTION.tempMinC, LIGHT_SOLUTION.tempMaxC, "°C for Light's solution");
    return LIGHT_SOLUTION.ehV;
  }
  const first = ZOBELL_TABLE[0];
  const last = ZOBELL_TABLE[ZOBELL_TABLE.length - 1];
  requireInRange('tempC', tempC, first.tempC, last.tempC, "°C for ZoBell's solution");
  // Extrapolating the table is not supported by the source, hence the hard limits above.
  for (let i = 1; i < ZOBELL_TABLE.length; i++) {
    const lo = ZOBELL_TABLE[i - 1];
    const hi = ZOBELL_TABLE[i];
    if (tempC <= hi.tempC) {
      return lo.ehV + ((hi.ehV - lo.ehV) * (tempC - lo.tempC)) / (hi.tempC - lo.tempC);
    }
  }
  return last.ehV;
}

export type ProbeCheckResult = { expectedMv: number; errorMv: number; pass: boolean };

/**
 * Checks a probe against a standard solution.
 * @param input.readingMv probe reading in the standard vs its own reference, mV
 * @param input.toleranceMv allowed |error|, mV (> 0; 15 mV per a probe maker's manual, 10 mV also common)
 * @returns expectedMv = (E_standard − E_ref(T))·1000, errorMv = reading − expected, pass = |error| ≤ tolerance
 */
export function probeCheck(input: {
  standard: StandardSolution;
  tempC: number;
  reference: ReferenceElectrode;
  readingMv: number;
  toleranceMv: number;
}): ProbeCheckResult {
  const readingMv = requireInRange('readingMv', input.readingMv, -ORP_LIMIT_MV, ORP_LIMIT_MV, 'mV');
  const toleranceMv = requirePositive('toleranceMv', input.toleranceMv, TOLERANCE_LIMIT_MV, 'mV');
  const eStdV = standardPotentialV(input.standard, input.tempC);
  const expectedMv = (eStdV - referencePotentialV(input.reference, input.tempC)) * 1000;
  const errorMv = readingMv - expectedMv;
  // A hair of slack so a reading exactly on the tolerance is not failed by binary rounding.
  return { expectedMv, errorMv, pass: Math.abs(errorMv) <= toleranceMv + 1e-9 };
}
