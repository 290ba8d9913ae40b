import { QueryTypes } from 'sequelize';
import { nernstSlopeV } from '../../../../shared/redox/index.ts';
import type { AssayMatch } from '../../../../shared/schemas/assays.ts';
import { Tank } from '../../db/models.ts';

type Row = { assay_id: number; probe_id: number; n: number; orp: number; temp: number; ln_ratio: number; cv: number };

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
  const rows = await Tank.sequelize!.query<Row>(
    `SELECT a.id AS assay_id, r.probe_id, COUNT(*) AS n, AVG(r.orp_mv) AS orp, AVG(r.temp_c) AS temp,
            AVG(LN(r.ratio)) AS ln_ratio, MAX(r.calibration_version) AS cv
       FROM assays a
       JOIN probes p ON p.tank_id = a.tank_id
       JOIN readings r ON r.probe_id = p.id
        AND r.ts BETWEEN a.sampled_at - INTERVAL :us MICROSECOND AND a.sampled_at + INTERVAL :us MICROSECOND
      WHERE a.id IN (:ids)
      GROUP BY a.id, r.probe_id`,
    { replacements: { ids: assays.map((a) => a.id), us: Math.round(windowMin * 60e6) }, type: QueryTypes.SELECT },
  );
  const best = new Map<number, Row>();
  for (const r of rows) {
    const prev = best.get(r.assay_id);
    if (!prev || Number(r.n) > Number(prev.n)) best.set(r.assay_id, r);
  }
  for (const a of assays) {
    const r = best.get(a.id);
    if (!r) {
      out.set(a.id, NO_MATCH);
      continue;
    }
    const tempC = Number(r.temp);
    const lnProbe = Number(r.ln_ratio);
    let diffMv: number | null = null;
    try {
      if (a.labRatio !== null) diffMv = (lnProbe - Math.log(a.labRatio)) * nernstSlopeV(tempC) * 1000;
    } catch {
      diffMv = null; // a stored temperature outside the supported range: no difference rather than a failed list
    }
    out.set(a.id, {
      n: Number(r.n), probeId: r.probe_id, orpMv: Number(r.orp), tempC, probeRatio: Math.exp(lnProbe), diffMv,
      calibrationVersion: Number(r.cv),
    });
  }
  return out;
}
