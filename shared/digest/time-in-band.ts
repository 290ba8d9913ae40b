/** One minute of a tank's 1-minute rollup: bucket start (UTC ms) and the mean log10 ratio of that minute. */
export type MinutePoint = { tMs: number; logRatio: number };

/** A band in force from fromMs until the next span starts (ratio, not log). */
export type BandSpan = { fromMs: number; low: number; high: number };

export type BandMinutes = { inBand: number; above: number; below: number; noData: number; total: number };

const MINUTE_MS = 60_000;

/** Whole minutes whose start lies in [fromMs, toMs). */
export function minutesIn(fromMs: number, toMs: number): number {
  const first = Math.ceil(fromMs / MINUTE_MS);
  const end = Math.ceil(toMs / MINUTE_MS);
  return Math.max(0, end - first);
}

/**
 * Classifies every minute of [fromMs, toMs) as in band, above, below or no data.
 * A minute counts by its geometric-mean ratio against the band in force at its start
 * (low ≤ ratio ≤ high is in band). A minute without a rollup row is "no data", never in
 * band: a dead probe must not make a shift look good.
 * @param points 1-minute rollup points, ascending by tMs (repeats and out-of-range points are ignored)
 * @param bands band spans, ascending by fromMs; minutes before the first span use the first span
 */
export function timeInBand(points: MinutePoint[], bands: BandSpan[], fromMs: number, toMs: number): BandMinutes {
  const total = minutesIn(fromMs, toMs);
  const out: BandMinutes = { inBand: 0, above: 0, below: 0, noData: 0, total };
  if (bands.length === 0) {
    out.noData = total;
    return out;
  }
  const logs = bands.map((b) => ({ fromMs: b.fromMs, lo: Math.log10(b.low), hi: Math.log10(b.high) }));
  let bi = 0;
  let last = -Infinity;
  let seen = 0;
  for (const p of points) {
    if (p.tMs < fromMs || p.tMs >= toMs || p.tMs <= last || !Number.isFinite(p.logRatio)) continue;
    last = p.tMs;
    while (bi + 1 < logs.length && logs[bi + 1].fromMs <= p.tMs) bi += 1;
    const b = logs[bi];
    seen += 1;
    if (p.logRatio > b.hi) out.above += 1;
    else if (p.logRatio < b.lo) out.below += 1;
    else out.inBand += 1;
  }
  out.noData = total - seen;
  return out;
}

/** Minutes as a share of the total, in percent (0 when the range is empty). */
export function percentOf(minutes: number, total: number): number {
  return total > 0 ? (minutes / total) * 100 : 0;
}
