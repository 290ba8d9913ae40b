/**
 * Ordinary least squares for the handful of parameters a calibration has (at most three),
 * with the statistics a metallurgist needs to judge a fit: standard errors, residual
 * standard error, leverages and externally studentized residuals.
 */

export type OlsResult = {
  /** Fitted coefficients, one per design column. */
  beta: number[];
  residuals: number[];
  /** Residual standard error √(Σr²/(n − p)); NaN when n = p. */
  s: number;
  /** Standard error of each coefficient, s·√((XᵀX)⁻¹)ᵢᵢ. */
  se: number[];
  /** (XᵀX)⁻¹, so callers can take the variance of any linear combination. */
  inverse: number[][];
  /** Leverage hᵢᵢ of each row. */
  leverage: number[];
  n: number;
  p: number;
};

/** Inverts a small symmetric positive-definite matrix (Gauss–Jordan, partial pivoting); null when singular. */
function invert(a: number[][]): number[][] | null {
  const p = a.length;
  const m = a.map((row, i) => [...row, ...row.map((_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...a.map((row, i) => Math.abs(row[i])));
  for (let c = 0; c < p; c++) {
    let pivot = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(m[r][c]) > Math.abs(m[pivot][c])) pivot = r;
    // A pivot this small relative to the diagonal means two columns carry the same information.
    if (!(Math.abs(m[pivot][c]) > scale * 1e-12)) return null;
    [m[c], m[pivot]] = [m[pivot], m[c]];
    const d = m[c][c];
    for (let j = 0; j < 2 * p; j++) m[c][j] /= d;
    for (let r = 0; r < p; r++) {
      if (r === c) continue;
      const f = m[r][c];
      if (f !== 0) for (let j = 0; j < 2 * p; j++) m[r][j] -= f * m[c][j];
    }
  }
  return m.map((row) => row.slice(p));
}

const dot = (a: number[], b: number[]) => a.reduce((s, x, i) => s + x * b[i], 0);

/**
 * Fits y = X·β by ordinary least squares.
 * @param rows design matrix X, one row per observation
 * @param y observations
 * @returns the fit, or null when the columns are collinear or there are fewer rows than columns
 */
export function ols(rows: number[][], y: number[]): OlsResult | null {
  const n = rows.length;
  const p = rows[0]?.length ?? 0;
  if (p === 0 || n < p) return null;
  const xtx = Array.from({ length: p }, (_, i) => Array.from({ length: p }, (_, j) => rows.reduce((s, r) => s + r[i] * r[j], 0)));
  const inverse = invert(xtx);
  if (!inverse) return null;
  const xty = Array.from({ length: p }, (_, i) => rows.reduce((s, r, k) => s + r[i] * y[k], 0));
  const beta = inverse.map((row) => dot(row, xty));
  const residuals = rows.map((r, k) => y[k] - dot(r, beta));
  const sse = residuals.reduce((s, r) => s + r * r, 0);
  const s = n > p ? Math.sqrt(sse / (n - p)) : NaN;
  const se = inverse.map((row, i) => s * Math.sqrt(row[i]));
  const leverage = rows.map((r) => dot(r, inverse.map((row) => dot(row, r))));
  return { beta, residuals, s, se, inverse, leverage, n, p };
}

/**
 * Externally studentized residuals tᵢ = rᵢ / (s₍ᵢ₎·√(1 − hᵢᵢ)), where s₍ᵢ₎ is the residual
 * standard error with observation i left out (from the leave-one-out identity, no refit).
 * @param floor residuals smaller than this are treated as exact (rounding, not error)
 * @returns one value per observation; null where it is undefined (n − p < 2 or hᵢᵢ = 1)
 */
export function studentizedResiduals(fit: OlsResult, floor: number): Array<number | null> {
  const { n, p, residuals, leverage } = fit;
  if (n - p < 2) return residuals.map(() => null);
  const sse = residuals.reduce((s, r) => s + r * r, 0);
  return residuals.map((r, i) => {
    const oneMinusH = 1 - leverage[i];
    if (!(oneMinusH > 1e-12)) return null;
    if (Math.abs(r) < floor) return 0;
    const s2 = Math.max(0, (sse - (r * r) / oneMinusH) / (n - p - 1));
    // The others fit exactly once this one is left out: it stands out without limit.
    if (s2 <= floor * floor) return r > 0 ? Infinity : -Infinity;
    return r / Math.sqrt(s2 * oneMinusH);
  });
}
