import type { Sample } from '../../../../shared/alarms/measures.ts';

/** Keep samples at least this far apart: bounds memory when a probe reports faster than planned. */
const MIN_SPACING_MS = 1000;
/** Longest window kept; definitions allow at most 3 h. */
const MAX_KEEP_MS = 3 * 3600_000 + 60_000;

/**
 * Recent ORP samples per probe for the windowed kinds (rate, flat-line, noise), filled from
 * the database once per probe after a start so a restart does not blind them for a window.
 */
export class SampleWindows {
  private byProbe = new Map<number, Sample[]>();
  private loaded = new Set<number>();

  constructor(private readonly load: (probeId: number, sinceMs: number) => Promise<Sample[]>) {}

  /** Loads a probe's recent history the first time it is seen. */
  async ensure(probeId: number, nowMs: number, keepMs: number): Promise<void> {
    if (this.loaded.has(probeId)) return;
    this.loaded.add(probeId);
    const history = await this.load(probeId, nowMs - Math.min(keepMs, MAX_KEEP_MS));
    const current = this.byProbe.get(probeId) ?? [];
    this.byProbe.set(probeId, []);
    for (const s of [...history, ...current].sort((a, b) => a.tMs - b.tMs)) this.push(probeId, s);
  }

  /**
   * Appends in time order; older or too-close samples are dropped (redeliveries, bursts), and
   * samples older than `keepMs` (the probe's longest window plus a margin) are let go.
   */
  push(probeId: number, s: Sample, keepMs = MAX_KEEP_MS): void {
    const list = this.byProbe.get(probeId) ?? [];
    const last = list[list.length - 1];
    if (last && s.tMs < last.tMs + MIN_SPACING_MS) return;
    list.push(s);
    const oldest = s.tMs - Math.min(keepMs, MAX_KEEP_MS);
    let drop = 0;
    while (drop < list.length && list[drop].tMs < oldest) drop += 1;
    if (drop > 0) list.splice(0, drop);
    this.byProbe.set(probeId, list);
  }

  samples(probeId: number): readonly Sample[] {
    return this.byProbe.get(probeId) ?? [];
  }
}
