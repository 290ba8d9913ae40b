/**
 * Window measures for the probe-health kinds. Pure functions over samples sorted by time.
 * Each returns null when the window is not covered well enough to judge: an alarm must not
 * rest on two samples after a restart.
 */
export type Sample = { tMs: number; orpMv: number };

/** Share of the window that must hold samples before a windowed measure is trusted. */
const COVERAGE = 0.8;
const MIN_SAMPLES = 3;

/** Samples inside (endMs − windowS, endMs], or null when they do not cover the window. */
export function windowOf(samples: readonly Sample[], endMs: number, windowS: number): Sample[] | null {
  const startMs = endMs - windowS * 1000;
  const inside = samples.filter((s) => s.tMs > startMs && s.tMs <= endMs);
  if (inside.length < MIN_SAMPLES) return null;
  if (inside[inside.length - 1].tMs - inside[0].tMs < windowS * 1000 * COVERAGE) return null;
  return inside;
}

/** Least-squares slope in mV per minute. */
export function slopeMvPerMin(w: readonly Sample[]): number {
  const t0 = w[0].tMs;
  const n = w.length;
  let sx = 0, sy = 0, sxx = 0, sxy = 0;
  for (const s of w) {
    const x = (s.tMs - t0) / 60_000;
    sx += x; sy += s.orpMv; sxx += x * x; sxy += x * s.orpMv;
  }
  const den = n * sxx - sx * sx;
  return den === 0 ? 0 : (n * sxy - sx * sy) / den;
}

/** max − min in mV: a healthy probe always wanders a little; a dead one does not. */
export function spreadMv(w: readonly Sample[]): number {
  let lo = Infinity, hi = -Infinity;
  for (const s of w) {
    lo = Math.min(lo, s.orpMv);
    hi = Math.max(hi, s.orpMv);
  }
  return hi - lo;
}

/**
 * Spread of the residuals around the least-squares line, in mV: a real ramp (feed upset,
 * oxidant dosing) has a large plain spread but little residual, electrical noise has both.
 */
export function detrendedSpreadMv(w: readonly Sample[]): number {
  const slope = slopeMvPerMin(w);
  const t0 = w[0].tMs;
  const meanX = w.reduce((a, s) => a + (s.tMs - t0) / 60_000, 0) / w.length;
  const meanY = w.reduce((a, s) => a + s.orpMv, 0) / w.length;
  const residuals = w.map((s) => ({ tMs: s.tMs, orpMv: s.orpMv - (meanY + slope * ((s.tMs - t0) / 60_000 - meanX)) }));
  return spreadMv(residuals);
}

export type WindowedKind = 'orp-rate' | 'probe-flatline' | 'probe-noisy';

/** The measured value of a windowed kind at endMs, or null when the window is not covered. */
export function windowedValue(kind: WindowedKind, samples: readonly Sample[], endMs: number, windowS: number): number | null {
  const w = windowOf(samples, endMs, windowS);
  if (!w) return null;
  if (kind === 'orp-rate') return Math.abs(slopeMvPerMin(w));
  if (kind === 'probe-flatline') return spreadMv(w);
  return detrendedSpreadMv(w);
}
