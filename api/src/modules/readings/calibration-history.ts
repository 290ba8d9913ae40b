import type { Pool } from '../../db/pool.ts';
import { lookupsRepository, type CalibrationRow } from './lookups.repository.ts';
import type { DecodedReading } from './decode.ts';
import { convertReading, type ConvertedReading, type PipelineOptions } from './convert.ts';
import type { ProbeEntry, ProbeLookup } from './probe-cache.ts';

type Cal = NonNullable<ProbeEntry['calibration']> & { validFromMs: number };

/**
 * Every calibration of every tank, for converting past readings with the calibration that was
 * valid when they were taken (the live path uses the newest one). Added for the historical
 * import in the API; it reuses convertReading so both paths share one set of rules.
 */
export class CalibrationHistory {
  private constructor(private readonly byTank: Map<number, Cal[]>) {}

  static fromRows(rows: CalibrationRow[]): CalibrationHistory {
    const byTank = new Map<number, Cal[]>();
    for (const r of rows) {
      const list = byTank.get(r.tankId) ?? [];
      list.push({
        version: r.version, formalPotentialV: r.formalPotentialV, formalCoeffVPerK: r.formalCoeffVPerK, slopeEfficiency: r.slopeEfficiency ?? 1,
        validFromMs: r.validFromMs,
      });
      byTank.set(r.tankId, list);
    }
    // Same valid_from twice: the higher version wins, as a later correction of the same fit.
    for (const list of byTank.values()) list.sort((a, b) => a.validFromMs - b.validFromMs || a.version - b.version);
    return new CalibrationHistory(byTank);
  }

  static async load(pool: Pool): Promise<CalibrationHistory> {
    return CalibrationHistory.fromRows(await lookupsRepository.calibrations(pool));
  }

  /** The calibration in force at tsMs: the latest valid_from ≤ tsMs; null before the first one. */
  at(tankId: number, tsMs: number): Cal | null {
    const list = this.byTank.get(tankId);
    if (!list || list.length === 0 || list[0].validFromMs > tsMs) return null;
    let lo = 0;
    let hi = list.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (list[mid].validFromMs <= tsMs) lo = mid;
      else hi = mid - 1;
    }
    return list[lo];
  }
}

/**
 * convertReading with the calibration valid at the reading's own time instead of the newest.
 * The probe lookup is narrowed to one entry whose calibration is swapped, so every other
 * check (site, probe ownership, clock window, conversion guards) is the live path's own.
 */
export function convertReadingAt(
  r: DecodedReading, lookup: ProbeLookup, history: CalibrationHistory, opts: PipelineOptions,
): ConvertedReading | string {
  const entry = lookup.probe(r.probeTag);
  const tsMs = Date.parse(r.ts);
  if (!entry || !Number.isFinite(tsMs)) return convertReading(r, lookup, opts);
  const cal = history.at(entry.tankId, tsMs);
  if (!cal) return `no calibration of tank ${entry.tankId} was valid at ${r.ts} (probe '${r.probeTag}')`;
  const view: ProbeLookup = {
    hasSite: (tag) => lookup.hasSite(tag),
    probe: (tag) => (tag === entry.probeTag ? { ...entry, calibration: cal } : lookup.probe(tag)),
  };
  return convertReading(r, view, opts);
}
