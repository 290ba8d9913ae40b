import { nernstSlopeV } from '../../../../shared/redox/index.ts';
import type { AssayMatch } from '../../../../shared/schemas/assays.ts';
import { assaysRepository, type ReadingsNearAssay } from './assays.repository.ts';

export const NO_MATCH: AssayMatch = { n: 0, probeId: null, orpMv: null, tempC: null, probeRatio: null, diffMv: null, calibrationVersion: null };

/** Lab Fe³⁺/Fe²⁺ = (total − Fe²⁺)/Fe²⁺, or null when it has no finite, positive value. */
export function labRatioOf(fe2: number, feTotal: number): number | null {
  const r = (feTotal - fe2) / fe2;
  return fe2 > 0 && fe2 < feTotal && Number.isFinite(r) && r > 0 ? r : null;
}

/**
 * Pairs each assay with the tank's readings within ±window of its sampling time: mean ORP and
 * temperature (for calibration), and the probe ratio as the mean of ln(ratio), since ratios are
 * log-normal around the band and an arithmetic mean would lean towards the high readings.
 * When a probe was swapped inside the window, the probe with most readings wins.
 */
export async function matchAssays(
  assays: Array<{ id: number; labRatio: number | null }>, windowMin: number,
): Promise<Map<number, AssayMatch>> {
  const out = new Map<number, AssayMatch>();
  if (assays.length === 0) return out;
  const rows = await assaysRepository.readingsNearAssays(assays.map((a) => a.id), windowMin);
  const best = new Map<number, ReadingsNearAssay>();
  for (const r of rows) {
    const prev = best.get(r.assayId);
    if (!prev || r.n > prev.n) best.set(r.assayId, r);
  }
  for (const a of assays) {
    const r = best.get(a.id);
    if (!r) {
      out.set(a.id, NO_MATCH);
      continue;
    }
    const { tempC, lnRatio: lnProbe } = r;
    let diffMv: number | null = null;
    try {
      if (a.labRatio !== null) diffMv = (lnProbe - Math.log(a.labRatio)) * nernstSlopeV(tempC) * 1000;
    } catch {
      diffMv = null; // a stored temperature outside the supported range: no difference rather than a failed list
    }
    out.set(a.id, {
      n: r.n, probeId: r.probeId, orpMv: r.orpMv, tempC, probeRatio: Math.exp(lnProbe), diffMv,
      calibrationVersion: r.calibrationVersion,
    });
  }
  return out;
}
