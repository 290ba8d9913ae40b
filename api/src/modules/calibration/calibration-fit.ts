import {
  fitFormalPotential, formalPotentialAtV, ratioToOrpMv, type AssaySample, type FormalPotentialFit, type ReferenceElectrode,
} from '../../../../shared/redox/index.ts';
import type { Assay } from '../../../../shared/schemas/assays.ts';
import { SLOPE_EFFICIENCY_OK, type FitPoint, type FitResult } from '../../../../shared/schemas/calibration.ts';
import { AppError } from '../../lib/app-error.ts';
import type { ProbeRef } from './calibration.repository.ts';

type Current = { version: number; formalPotentialV: number; formalCoeffVPerK: number; slopeEfficiency: number } | null;

const sameReference = (a: ReferenceElectrode, b: ReferenceElectrode) => a.e25V === b.e25V && a.coeffVPerK === b.coeffVPerK;
const rms = (xs: number[]) => Math.sqrt(xs.reduce((s, x) => s + x * x, 0) / xs.length);

/** Which k the fit used and why, in words for the Calibration screen. */
function tempCoeffNote(fit: FormalPotentialFit, spanC: number, minSpanC: number, cur: Current): string {
  const k = `${(fit.formalCoeffVPerK * 1000).toFixed(2)} mV/K`;
  const span = `the assays span ${spanC.toFixed(1)} °C`;
  switch (fit.tempCoeffBasis) {
    case 'fitted': return `k = ${k}, fitted: ${span} (at least ${minSpanC} °C needed)`;
    case 'held-too-few-assays': return `k = ${k}, kept from calibration v${cur?.version}: fewer than 3 usable assays, too few to fit it`;
    case 'held-narrow-span':
    case 'held': return `k = ${k}, kept from calibration v${cur?.version}: ${span}, less than the ${minSpanC} °C needed to fit it`;
    default: return `k = 0 (no calibration in force to keep it from, and ${span}, less than ${minSpanC} °C): E°′ holds only near the assays' mean temperature`;
  }
}

/**
 * Chooses the usable assays, fits E°′ (and k when the temperatures span enough) with
 * shared/redox, and compares the result with the calibration in force. All chemistry is in
 * shared/redox; this only decides which assays count and says why the others do not.
 */
export function fitFromAssays(input: {
  tankId: number; assays: Assay[]; excluded: Array<{ assayId: number; reason: string }>; probes: ProbeRef[];
  current: Current; minTempSpanC: number; windowMin: number; slopeEfficiency: number;
}): FitResult {
  const active = input.probes.find((p) => p.active) ?? input.probes[0];
  if (!active) throw AppError.badRequest('This tank has no probe, so there is nothing to calibrate');
  const excludedIds = new Map(input.excluded.map((e) => [e.assayId, e.reason]));
  const skipped: FitResult['skipped'] = [];
  const used: Array<{ assay: Assay; sample: AssaySample }> = [];
  for (const a of input.assays) {
    if (excludedIds.has(a.id)) continue;
    const skip = (reason: string) => skipped.push({ assayId: a.id, sampledAt: a.sampledAt, reason });
    const m = a.match;
    const probe = input.probes.find((p) => p.id === m.probeId);
    if (a.labRatio === null) skip('Fe²⁺ is 0 or equals total Fe, so the lab gives no ratio');
    else if (m.n === 0 || m.orpMv === null || m.tempC === null) skip(`no probe readings within ±${input.windowMin} min of sampling`);
    else if (!probe || !sameReference(probe.reference, active.reference)) skip('matched to a probe with a different reference electrode');
    else used.push({ assay: a, sample: { orpMv: m.orpMv, tempC: m.tempC, fe2: a.fe2GPerL, feTotal: a.feTotalGPerL } });
  }
  const temps = used.map((u) => u.sample.tempC);
  const tempSpanC = temps.length ? Math.max(...temps) - Math.min(...temps) : 0;
  const meanTempC = temps.length ? temps.reduce((s, t) => s + t, 0) / temps.length : 25;
  if (used.length < 2) {
    throw AppError.badRequest(`At least 2 usable assays are needed (${used.length} usable, ${skipped.length} skipped, ${excludedIds.size} excluded)`, { skipped });
  }
  let fit: FormalPotentialFit;
  try {
    // Over a narrow span k stays at the value in force instead of silently becoming 0.
    fit = fitFormalPotential(used.map((u) => u.sample), {
      reference: active.reference, fitTempCoeff: true, minTempSpanC: input.minTempSpanC, tempCoeffVPerK: input.current?.formalCoeffVPerK,
      slopeEfficiency: input.slopeEfficiency,
    });
  } catch (err) {
    throw AppError.badRequest(`The fit failed: ${(err as Error).message}`);
  }
  const cur = input.current;
  const points: FitPoint[] = used.map((u, i) => ({
    assayId: u.assay.id, sampledAt: u.assay.sampledAt, labRatio: u.assay.labRatio!, orpMv: u.sample.orpMv, tempC: u.sample.tempC,
    residualMv: fit.residualsMv[i],
    studentizedResidual: fit.studentizedResiduals[i],
    suspect: fit.suspectSamples.includes(i),
    nernstTermV: fit.points[i].nernstTermV,
    eSheV: fit.points[i].eSheV,
    pointFormalPotentialV: fit.points[i].formalPotentialV,
    currentResidualMv: cur
      ? u.sample.orpMv - ratioToOrpMv({ ratio: u.assay.labRatio!, tempC: u.sample.tempC, reference: active.reference, formalPotentialV: cur.formalPotentialV, formalCoeffVPerK: cur.formalCoeffVPerK, slopeEfficiency: cur.slopeEfficiency })
      : null,
  }));
  const eff = fit.slopeEfficiency;
  const slopeWarning = eff !== null && (eff < SLOPE_EFFICIENCY_OK.min || eff > SLOPE_EFFICIENCY_OK.max)
    ? `Slope efficiency ${(eff * 100).toFixed(1)} % is outside ${SLOPE_EFFICIENCY_OK.min * 100}–${SLOPE_EFFICIENCY_OK.max * 100} %: clean or check the probe before trusting this fit`
    : null;
  return {
    tankId: input.tankId, formalPotentialV: fit.formalPotentialV, formalCoeffVPerK: fit.formalCoeffVPerK, fittedTempCoeff: fit.fittedTempCoeff,
    tempCoeffBasis: fit.tempCoeffBasis, usedSlopeEfficiency: input.slopeEfficiency,
    tempCoeffNote: tempCoeffNote(fit, tempSpanC, input.minTempSpanC, cur),
    tempSpanC, meanTempC, n: fit.n, rmsMv: fit.rmsMv, slopeEfficiency: eff, slopeWarning, points, skipped,
    standardErrors: fit.standardErrors, atMeanTemp: fit.atMeanTemp, slopeFit: fit.slopeFit,
    excluded: input.excluded.filter((e) => input.assays.some((a) => a.id === e.assayId)),
    current: cur && {
      version: cur.version, formalPotentialV: cur.formalPotentialV, formalCoeffVPerK: cur.formalCoeffVPerK,
      rmsMv: points.length ? rms(points.map((p) => p.currentResidualMv!)) : null,
      shiftMv: (formalPotentialAtV(fit.formalPotentialV, meanTempC, fit.formalCoeffVPerK)
        - formalPotentialAtV(cur.formalPotentialV, meanTempC, cur.formalCoeffVPerK)) * 1000,
    },
  };
}
