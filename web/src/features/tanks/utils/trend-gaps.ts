import type { TrendResponse } from '@shared/schemas/plant';
import { STALE_INTERVALS } from '../../../lib/freshness';

type Series = 'ratio' | 'ratioMin' | 'ratioMax' | 'orpMv' | 'tempC';

/** A trend as the charts draw it: a null in every series marks a gap in the data. */
export type ChartTrend = Omit<TrendResponse, Series> & Record<Series, Array<number | null>>;

const SERIES: Series[] = ['ratio', 'ratioMin', 'ratioMax', 'orpMv', 'tempC'];

/** Seconds between two points when nothing is missing: the probe's interval for raw data, else the bucket. */
export function expectedStepS(resolution: TrendResponse['resolution'], probeIntervalS: number | null | undefined): number {
  if (resolution === '1m') return 60;
  if (resolution === '1h') return 3600;
  return probeIntervalS && probeIntervalS > 0 ? probeIntervalS : 60;
}

/** The median spacing of the points, s (0 with fewer than two). */
function medianStepS(t: number[]): number {
  const steps = t.slice(1).map((v, i) => v - t[i]).sort((a, b) => a - b);
  return steps.length ? steps[Math.floor(steps.length / 2)] : 0;
}

/**
 * Inserts a null point into every series wherever two neighbouring points lie more than
 * STALE_INTERVALS steps apart (the same rule that marks a probe stale), so the line breaks over
 * an outage instead of drawing a straight run across hours without data. The step is the
 * expected one or the data's own median spacing, whichever is longer (a probe may have
 * reported less often in the past than it is set to now).
 */
export function withGaps(trend: TrendResponse, stepS: number): ChartTrend {
  const limit = STALE_INTERVALS * Math.max(stepS, medianStepS(trend.t));
  const out: ChartTrend = { ...trend, t: [], ratio: [], ratioMin: [], ratioMax: [], orpMv: [], tempC: [] };
  for (let i = 0; i < trend.t.length; i += 1) {
    if (i > 0 && trend.t[i] - trend.t[i - 1] > limit) {
      out.t.push((trend.t[i] + trend.t[i - 1]) / 2);
      for (const s of SERIES) out[s].push(null);
    }
    out.t.push(trend.t[i]);
    for (const s of SERIES) out[s].push(trend[s][i]);
  }
  return out;
}
