import { faraday, gasConstant } from 'mathjs';
import type { AssaySample, ReferenceElectrode } from '../../shared/redox';

// Synthetic assays are generated from the Nernst equation written out here with
// mathjs 15.2.0 constants (CODATA 2018), independently of the code under test.
export const F = faraday.toNumber('C/mol');
export const R = gasConstant.toNumber('J/(mol K)');

/**
 * A reference electrode with a plain linear temperature law and an id no built-in table uses,
 * so the generator below and the code under test agree on E_ref(T) by construction.
 * 0.210 V and -0.75 mV/K are the tabulated 3 M KCl value and the 3.5 M slope (Skoog et al.).
 */
export const linearRef: ReferenceElectrode = {
  id: 'test-linear', label: 'Ag/AgCl, linear test electrode', e25V: 0.21, coeffVPerK: -0.00075, source: 'test',
};

/** Deterministic pseudo-random numbers in [0, 1) (mulberry32), so failures reproduce. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type Truth = { e0V: number; kVPerK: number; slopeEff?: number };

/** One assay per (temperature, ratio) pair, with uniform noise of ±noiseMv on the reading. */
export function synthAssay(truth: Truth, tempC: number, ratio: number, noiseMv = 0, rand: () => number = Math.random, ref = linearRef): AssaySample {
  const feTotal = 12; // g/L
  const ehV = truth.e0V + truth.kVPerK * (tempC - 25) + (truth.slopeEff ?? 1) * ((R * (tempC + 273.15)) / F) * Math.log(ratio);
  const eRefV = ref.e25V + ref.coeffVPerK * (tempC - 25);
  const noise = (2 * rand() - 1) * noiseMv;
  return { orpMv: (ehV - eRefV) * 1000 + noise, tempC, fe2: feTotal / (1 + ratio), feTotal };
}

/** The full grid temps × ratios. */
export function synthAssays(truth: Truth, temps: number[], ratios: number[], noiseMv: number, seed: number, ref = linearRef): AssaySample[] {
  const rand = seeded(seed);
  return temps.flatMap((tempC) => ratios.map((ratio) => synthAssay(truth, tempC, ratio, noiseMv, rand, ref)));
}
