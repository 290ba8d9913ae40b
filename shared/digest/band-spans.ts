import type { BandSpan } from './time-in-band.ts';

/** A band change that took effect (applied directly, or approved) at effectiveMs. */
export type EffectiveBandChange = { effectiveMs: number; old: { low: number; high: number }; next: { low: number; high: number } };

/**
 * The bands in force over [fromMs, toMs) for one tank, from its effective changes and its band
 * now. Before the first recorded change the tank ran on that change's old band; with no change
 * on record the current band has always been in force.
 * @returns spans ascending, the first starting at fromMs
 */
export function bandSpansFor(changes: EffectiveBandChange[], current: { low: number; high: number }, fromMs: number, toMs: number): BandSpan[] {
  const sorted = [...changes].sort((a, b) => a.effectiveMs - b.effectiveMs);
  const before = sorted.filter((c) => c.effectiveMs <= fromMs);
  const after = sorted.filter((c) => c.effectiveMs > fromMs);
  const initial = before.length > 0 ? before[before.length - 1].next : after.length > 0 ? after[0].old : current;
  const spans: BandSpan[] = [{ fromMs, low: initial.low, high: initial.high }];
  for (const c of after) {
    if (c.effectiveMs >= toMs) break;
    spans.push({ fromMs: c.effectiveMs, low: c.next.low, high: c.next.high });
  }
  return spans;
}
