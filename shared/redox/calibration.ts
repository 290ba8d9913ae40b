/**
 * Formal-potential calibration from lab assays. Each assay (Fe²⁺ by titration,
 * total Fe by AAS/ICP) paired with the probe reading at sampling time gives
 *   E°′_i = E_SHE,i − s·(R·T_i/F)·ln(ratio_lab,i),  ratio_lab = (feTotal − fe2)/fe2
 * and E°′25 (and k where the temperatures spread enough) follow by ordinary least squares,
 * with standard errors, a residual standard error and a check for gross assay errors.
 */
import { ORP_LIMIT_MV, TEMP_COEFF_LIMIT_V_PER_K } from './constants';
import { requireInRange, requirePositive, requireTempC } from './guards';
import { ols, studentizedResiduals, type OlsResult } from './least-squares';
import { nernstSlopeV } from './nernst';
import { referencePotentialV, requireReference, type ReferenceElectrode } from './reference-electrodes';

export type AssaySample = { orpMv: number; tempC: number; fe2: number; feTotal: number };

export type FitOptions = {
  reference: ReferenceElectrode;
  /** Fit k when the assays' temperatures spread at least minTempSpanC; otherwise k is held. */
  fitTempCoeff?: boolean;
  /** k held when it is not fitted (the coefficient in force), V/K; 0 when not given, and the fit says so. */
  tempCoeffVPerK?: number;
  /** Smallest temperature spread from which k is fitted, °C (default 5). */
  minTempSpanC?: number;
  /** Slope efficiency the E°′ fit assumes (the accepted one), default 1 = the full Nernst slope. */
  slopeEfficiency?: number;
};

/** Why k has the value it has. */
export type TempCoeffBasis = 'fitted' | 'held' | 'held-narrow-span' | 'held-too-few-assays' | 'default-zero';

export type FormalPotentialFit = {
  /** Fitted E°′ vs SHE at 25 °C, V. */
  formalPotentialV: number;
  /** Temperature coefficient, V/K: fitted, or the held value (see tempCoeffBasis). */
  formalCoeffVPerK: number;
  fittedTempCoeff: boolean;
  tempCoeffBasis: TempCoeffBasis;
  /** Measured minus model-predicted probe reading per sample, mV. */
  residualsMv: number[];
  /** Residual standard error √(Σr²/(n − p)), mV, p = fitted parameters (NaN when n = p). */
  rmsMv: number;
  n: number;
  /** Parameters fitted: 1 (E°′) or 2 (E°′ and k). */
  p: number;
  tempSpanC: number;
  standardErrors: { formalPotentialV: number; formalCoeffVPerK: number | null };
  /** E°′ at the assays' mean temperature: the figure the tank's own readings depend on. */
  atMeanTemp: { tempC: number; formalPotentialV: number; standardErrorV: number };
  /** Externally studentized residual per sample (null when undefined: fewer than 5 assays). */
  studentizedResiduals: Array<number | null>;
  /** Indices of samples whose externally studentized residual exceeds SUSPECT_T (n ≥ 5). */
  suspectSamples: number[];
  /** Free-fitted slope / (R·T/F); 1 = ideal. null unless lab ratios span ≥ one decade. */
  slopeEfficiency: number | null;
  /** The joint fit behind slopeEfficiency: E_SHE = E°′25 + s·(R·T/F)·ln ratio + k·(T − 25). */
  slopeFit: {
    slopeEfficiency: number;
    standardError: number;
    formalPotentialV: number;
    formalCoeffVPerK: number;
    /** True when k was fitted jointly; false when it was held. */
    jointTempCoeff: boolean;
  } | null;
  /** Per sample, for plots: E_SHE (V), (R·T/F)·ln(ratio) (V) and E°′ at its own temperature (V). */
  points: Array<{ tempC: number; ratio: number; eSheV: number; nernstTermV: number; formalPotentialV: number }>;
};

/** Externally studentized residual above which an assay is marked suspect. */
export const SUSPECT_T = 3;
/** Fewest assays for the suspect check (below this one bad assay hides in the spread it causes). */
export const SUSPECT_MIN_N = 5;
/** Default temperature spread needed to fit k, °C: over less, k is mostly noise. */
export const DEFAULT_MIN_TEMP_SPAN_C = 5;

// Residuals below a nanovolt are rounding, not error.
const EXACT_V = 1e-9;

type Point = { tempC: number; ratio: number; eSheV: number; nernstTermV: number };

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
  return { tempC, ratio, eSheV, nernstTermV: nernstSlopeV(tempC) * Math.log(ratio) };
}

const mean = (values: number[]) => values.reduce((sum, v) => sum + v, 0) / values.length;
// reduce rather than Math.max(...xs), which overflows the call stack on very long arrays.
const max = (xs: number[]) => xs.reduce((m, x) => (x > m ? x : m), -Infinity);
const min = (xs: number[]) => xs.reduce((m, x) => (x < m ? x : m), Infinity);

function readOptions(options: FitOptions) {
  if (typeof options !== 'object' || options === null) throw new RangeError('options must be an object with a reference');
  const reference = requireReference('options.reference', options.reference);
  const heldK = options.tempCoeffVPerK === undefined ? undefined
    : requireInRange('options.tempCoeffVPerK', options.tempCoeffVPerK, -TEMP_COEFF_LIMIT_V_PER_K, TEMP_COEFF_LIMIT_V_PER_K, 'V/K');
  const minSpan = options.minTempSpanC === undefined ? DEFAULT_MIN_TEMP_SPAN_C
    : requireInRange('options.minTempSpanC', options.minTempSpanC, 0.1, 100, '°C');
  const slope = options.slopeEfficiency === undefined ? 1 : requireInRange('options.slopeEfficiency', options.slopeEfficiency, 0.5, 1.5);
  return { reference, heldK, minSpan, slope, wantK: options.fitTempCoeff === true };
}

/**
 * Fits the formal potential E°′ (and, with enough temperature spread, its coefficient k) to lab assays.
 * @param samples probe reading (orpMv, mV) and solution temperature (tempC, °C) at sampling,
 *   with Fe²⁺ (fe2) and total Fe (feTotal) in the same concentration unit
 * @param options.reference the probe's reference electrode
 * @param options.fitTempCoeff fit k when the temperatures span at least options.minTempSpanC (default 5 °C)
 *   and there are 3 or more assays; otherwise options.tempCoeffVPerK is held (0 when not given)
 * @returns E°′25 (V vs SHE) and k (V/K) with OLS standard errors, E°′ at the mean temperature,
 *   residuals and the residual standard error (mV), suspect assays, and the slope efficiency
 *   from a joint fit when the lab ratios span a decade
 * @throws RangeError for too few samples or bad values
 */
export function fitFormalPotential(samples: AssaySample[], options: FitOptions): FormalPotentialFit {
  if (!Array.isArray(samples) || samples.length < 2) {
    const got = Array.isArray(samples) ? `${samples.length} samples` : typeof samples;
    throw new RangeError(`samples must be an array of at least 2 assays (got ${got})`);
  }
  const opt = readOptions(options);
  const points = samples.map((s, i) => toPoint(s, i, opt.reference));
  const dts = points.map((p) => p.tempC - 25);
  const tempSpanC = max(dts) - min(dts);
  const e0s = points.map((p) => p.eSheV - opt.slope * p.nernstTermV);

  const canFitK = opt.wantK && tempSpanC >= opt.minSpan && points.length >= 3;
  const withK = canFitK ? ols(dts.map((dt) => [1, dt]), e0s) : null;
  let basis: TempCoeffBasis;
  let fit: OlsResult;
  let k: number;
  if (withK) {
    fit = withK;
    k = withK.beta[1];
    basis = 'fitted';
  } else {
    k = opt.heldK ?? 0;
    if (opt.wantK) basis = points.length < 3 ? 'held-too-few-assays' : 'held-narrow-span';
    else basis = opt.heldK === undefined ? 'default-zero' : 'held';
    fit = ols(dts.map(() => [1]), e0s.map((e, i) => e - k * dts[i]))!;
  }
  const e0V = fit.beta[0];
  const meanDt = mean(dts);
  // Var(a + b·m) = s²·cᵀ(XᵀX)⁻¹c with c = (1, m); with k held only a varies.
  const c = withK ? [1, meanDt] : [1];
  const varFactor = c.reduce((sum, ci, i) => sum + ci * c.reduce((s2, cj, j) => s2 + fit.inverse[i][j] * cj, 0), 0);
  const t = points.length >= SUSPECT_MIN_N ? studentizedResiduals(fit, EXACT_V) : points.map(() => null);

  return {
    formalPotentialV: e0V,
    formalCoeffVPerK: k,
    fittedTempCoeff: withK !== null,
    tempCoeffBasis: basis,
    // Residual of the probe reading = residual of E°′_i, since the other terms cancel.
    residualsMv: fit.residuals.map((r) => r * 1000),
    rmsMv: fit.s * 1000,
    n: points.length,
    p: fit.p,
    tempSpanC,
    standardErrors: { formalPotentialV: fit.se[0], formalCoeffVPerK: withK ? fit.se[1] : null },
    atMeanTemp: { tempC: 25 + meanDt, formalPotentialV: e0V + k * meanDt, standardErrorV: fit.s * Math.sqrt(varFactor) },
    studentizedResiduals: t,
    suspectSamples: t.flatMap((ti, i) => (ti !== null && Math.abs(ti) > SUSPECT_T ? [i] : [])),
    ...slopeEfficiencyFit(points, dts, tempSpanC, opt.minSpan, k),
    points: points.map((p, i) => ({ tempC: p.tempC, ratio: p.ratio, eSheV: p.eSheV, nernstTermV: p.nernstTermV, formalPotentialV: e0s[i] })),
  };
}

/**
 * Free-slope fit of E_SHE on (R·T/F)·ln(ratio) and (T − 25) jointly, so that ratios rising with
 * temperature cannot pass a temperature effect off as slope. Over a narrow temperature span k is
 * held instead. A slope below 1 points to a sluggish or fouled electrode or to a mixed potential.
 */
function slopeEfficiencyFit(points: Point[], dts: number[], tempSpanC: number, minSpan: number, heldK: number) {
  const ratios = points.map((p) => p.ratio);
  // Over less than a decade the slope is dominated by assay and probe noise.
  if (max(ratios) / min(ratios) < 10) return { slopeEfficiency: null, slopeFit: null };
  const joint = tempSpanC >= minSpan && points.length >= 4
    ? ols(points.map((p, i) => [1, p.nernstTermV, dts[i]]), points.map((p) => p.eSheV))
    : null;
  const fit = joint ?? ols(points.map((p) => [1, p.nernstTermV]), points.map((p, i) => p.eSheV - heldK * dts[i]));
  if (!fit || !Number.isFinite(fit.beta[1])) return { slopeEfficiency: null, slopeFit: null };
  return {
    slopeEfficiency: fit.beta[1],
    slopeFit: {
      slopeEfficiency: fit.beta[1],
      standardError: fit.se[1],
      formalPotentialV: fit.beta[0],
      formalCoeffVPerK: joint ? fit.beta[2] : heldK,
      jointTempCoeff: joint !== null,
    },
  };
}
