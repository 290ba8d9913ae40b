import type { MinutePoint } from './time-in-band.ts';

/** A series thinned for a small picture: t in seconds, log10 ratio or null where there was no data. */
export type Sparkline = { t: number[]; logRatio: (number | null)[] };

/**
 * Thins 1-minute points to at most `slots` equal slots over [fromMs, toMs), each the mean of
 * its minutes' log ratios (a geometric mean of the ratio). Empty slots stay null so the
 * picture shows a gap where the probe was silent instead of drawing a line across it.
 */
export function sparkline(points: MinutePoint[], fromMs: number, toMs: number, slots: number): Sparkline {
  const span = toMs - fromMs;
  const n = Math.max(1, Math.min(slots, Math.ceil(span / 60_000)));
  const width = span / n;
  const sum = new Float64Array(n);
  const count = new Uint32Array(n);
  for (const p of points) {
    if (p.tMs < fromMs || p.tMs >= toMs || !Number.isFinite(p.logRatio)) continue;
    const i = Math.min(n - 1, Math.floor((p.tMs - fromMs) / width));
    sum[i] += p.logRatio;
    count[i] += 1;
  }
  const out: Sparkline = { t: [], logRatio: [] };
  for (let i = 0; i < n; i += 1) {
    out.t.push(Math.round((fromMs + i * width) / 1000));
    out.logRatio.push(count[i] > 0 ? sum[i] / count[i] : null);
  }
  return out;
}
