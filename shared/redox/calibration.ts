/**
 * Formal-potential calibration from lab assays. Each assay (Fe²⁺ by titration,
 * total Fe by AAS/ICP) paired with the probe reading at sampling time gives
 *   E°′_i = E_SHE,i − (R·T_i/F)·ln(ratio_lab,i),  ratio_lab = (feTotal − fe2)/fe2
 * and E°′25 (and k where temperatures vary) follow by least squares.
 */
import { ORP_LIMIT_MV } from './constants';
import { requireInRange, requirePositive, requireTempC } from './guards';
import { nernstSlopeV } from './nernst';
import { referencePotentialV, requireReference, type ReferenceElectrode } from './reference-electrodes';

export type AssaySample = { orpMv: number; tempC: number; fe2: number; feTotal: number };

export type FormalPotentialFit = {
  /** Fitted E°′ vs SHE at 25 °C, V. */
  formalPotentialV: number;
  /** Fitted temperature coefficient, V/K (0 unless fitTempCoeff). */
  formalCoeffVPerK: number;
  /** Measured minus model-predicted probe reading per sample, mV. */
  residualsMv: number[];
  rmsMv: number;
  n: number;
  /** Free-fitted slope / (R·T/F); 1 = ideal. null unless lab ratios span ≥ one decade. */
  slopeEfficiency: number | null;
};

// A temperature "spread" smaller than this makes k pure noise (±1 mV over
// 0.1 K is ±10 mV/K), so we refuse rather than report a meaningless coefficient.
const MIN_TEMP_SPREAD_C = 1;

type Point = { tempC: number; ratio: number; eSheV: number; e0V: number };

function toPoint(s: AssaySample, i: number, reference: ReferenceElectrode): Point {
  const name = `samples[${i}]`;
  if (typeof s !== 'object' || s === null) throw new RangeError(`${name} must be an assay object`);
  const orpMv = requireInRange(`${name}.orpMv`, s.orpMv, -ORP_LIMIT_MV, ORP_LIMIT_MV, 'mV');
  const tempC = requireTempC(`${name}.tempC`, s.tempC);
  const feTotal = requirePositive(`${name}.feTotal`, s.feTotal);
  const fe2 = s.fe2;
  const ratio = (feTotal - fe2) / fe2;
  // fe2 = 0 makes the ratio infinite and fe2 = feTotal makes it 0: neither has a logarithm.
  const usable = typeof fe2 === 'number' && fe2 > 0 && fe2 < feTotal && ratio > 0 && Number.isFinite(ratio);
  if (!usable) {
    throw new RangeError(`${name}.fe2 must be a finite number in (0, feTotal) = (0, ${feTotal}) (got ${String(fe2)})`);
  }
  const eSheV = orpMv / 1000 + referencePotentialV(reference, tempC);
  return { tempC, ratio, eSheV, e0V: eSheV - nernstSlopeV(tempC) * Math.log(ratio) };
}

/** Ordinary least squares y = a + b·x, on centred data for numerical stability. */
function lineFit(xs: number[], ys: number[]): { a: number; b: number; sxx: number } {
  const mx = mean(xs);
  const my = mean(ys);
  let sxx = 0;
  let sxy = 0;
  xs.forEach((x, i) => {
    sxx += (x - mx) ** 2;
    sxy += (x - mx) * (ys[i] - my);
  });
  const b = sxx > 0 ? sxy / sxx : 0;
  return { a: my - b * mx, b, sxx };
}

function mean(values: number[]): number {
  return values.reduce((sum, v) => sum + v, 0) / values.length;
}

// reduce rather than Math.max(...xs), which overflows the call stack on very long arrays.
const max = (xs: number[]) => xs.reduce((m, x) => (x > m ? x : m), -Infinity);
const min = (xs: number[]) => xs.reduce((m, x) => (x < m ? x : m), Infinity);

/**
 * Fits the formal potential E°′ (and optionally its temperature coefficient k) to lab assays.
 * @param samples probe reading (orpMv, mV) and solution temperature (tempC, °C) at sampling,
 *   with Fe²⁺ (fe2) and total Fe (feTotal) in the same concentration unit
 * @param options.reference the probe's reference electrode
 * @param options.fitTempCoeff also fit k (needs ≥ 3 samples spanning ≥ 1 °C)
 * @returns E°′25 in V vs SHE, k in V/K, residuals in mV, their rms in mV,
 *   and the slope efficiency (1.0 = 100 % of R·T/F) when the lab ratios span a decade
 * @throws RangeError for too few samples, bad values, or no temperature spread when fitting k
 */
export function fitFormalPotential(
  samples: AssaySample[],
  options: { reference: ReferenceElectrode; fitTempCoeff?: boolean },
): FormalPotentialFit {
  const fitK = options?.fitTempCoeff === true;
  const minSamples = fitK ? 3 : 2;
  if (!Array.isArray(samples) || samples.length < minSamples) {
    const got = Array.isArray(samples) ? `${samples.length} samples` : typeof samples;
    const when = fitK ? ' when fitTempCoeff is true' : '';
    throw new RangeError(`samples must be an array of at least ${minSamples} assays${when} (got ${got})`);
  }
  const reference = requireReference('options.reference', options?.reference);
  const points = samples.map((s, i) => toPoint(s, i, reference));
  const dts = points.map((p) => p.tempC - 25);

  let e0V: number;
  let k = 0;
  if (fitK) {
    const spread = max(dts) - min(dts);
    if (spread < MIN_TEMP_SPREAD_C) {
      throw new RangeError(
        `samples[].tempC must span at least ${MIN_TEMP_SPREAD_C} °C to fit the temperature coefficient (got a spread of ${spread} °C)`,
      );
    }
    const fit = lineFit(dts, points.map((p) => p.e0V));
    e0V = fit.a;
    k = fit.b;
  } else {
    e0V = mean(points.map((p) => p.e0V));
  }

  // Residual of the probe reading = residual of E°′_i, since the other terms cancel.
  const residualsMv = points.map((p, i) => (p.e0V - (e0V + k * dts[i])) * 1000);
  const rmsMv = Math.sqrt(mean(residualsMv.map((r) => r * r)));
  return {
    formalPotentialV: e0V,
    formalCoeffVPerK: k,
    residualsMv,
    rmsMv,
    n: points.length,
    slopeEfficiency: slopeEfficiency(points, dts, k),
  };
}

/**
 * Free-slope fit of E_SHE (referred to 25 °C with the fitted k) against (R·T/F)·ln(ratio).
 * A slope below 1 points to a sluggish or fouled electrode or to a mixed potential.
 */
function slopeEfficiency(points: Point[], dts: number[], k: number): number | null {
  const ratios = points.map((p) => p.ratio);
  // Over less than a decade the slope is dominated by assay and probe noise.
  if (max(ratios) / min(ratios) < 10) return null;
  const xs = points.map((p) => nernstSlopeV(p.tempC) * Math.log(p.ratio));
  const ys = points.map((p, i) => p.eSheV - k * dts[i]);
  const fit = lineFit(xs, ys);
  return fit.sxx > 0 && Number.isFinite(fit.b) ? fit.b : null;
}
