import type {
  ApplyResult, CalibrationApplyInput, CalibrationFitInput, CalibrationOverview, FitResult, RecomputeInput, RecomputeResult,
} from '../../../../shared/schemas/calibration.ts';
import { Tank } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import type { Bus } from '../../realtime/bus.ts';
import { assaysService } from '../assays/assays.service.ts';
import { writeAudit } from '../audit.repository.ts';
import { referenceLabel } from '../plant/reference-label.ts';
import { siteSettingsRepository } from '../site-settings/site-settings.repository.ts';
import { fitFromAssays } from './calibration-fit.ts';
import { calibrationRepository as repo } from './calibration.repository.ts';
import { recomputeReadings } from './recompute.ts';

// The server refits and stores its own result. Readings still arriving inside a recent assay's
// window nudge the fit by a fraction of a mV; a larger move means the assays themselves changed.
const SAME_FIT_V = 0.0005;

async function requireTank(tankId: number) {
  const tank = await repo.tank(tankId);
  if (!tank) throw AppError.notFound('Tank');
  return tank;
}

export const calibrationService = {
  async overview(tankId: number): Promise<CalibrationOverview> {
    const tank = await requireTank(tankId);
    const [versions, probes, settings] = await Promise.all([repo.versions(tankId), repo.probes(tankId), siteSettingsRepository.forTank(tankId)]);
    const p = probes.find((x) => x.active) ?? null;
    return {
      tankId, tankTag: tank.tag,
      probe: p && { id: p.id, tag: p.tag, referenceLabel: referenceLabel(p.referenceId), referenceE25V: p.reference.e25V, referenceCoeffVPerK: p.reference.coeffVPerK, toleranceMv: p.toleranceMv },
      inForce: versions[0] ?? null, versions, minTempSpanC: settings.calibrationMinTempSpanC,
    };
  },

  async fit(tankId: number, input: CalibrationFitInput): Promise<FitResult> {
    await requireTank(tankId);
    const [assays, probes, versions, settings] = await Promise.all([
      assaysService.forTank(tankId, new Date(input.from), new Date(input.to)), repo.probes(tankId), repo.versions(tankId),
      siteSettingsRepository.forTank(tankId),
    ]);
    const current = versions[0] ?? null;
    return fitFromAssays({
      tankId, assays, excluded: input.excluded, probes, current, minTempSpanC: settings.calibrationMinTempSpanC,
      windowMin: settings.assayMatchWindowMin, slopeEfficiency: input.slopeEfficiency,
    });
  },

  /** Refits on the server, stores a new version with its fit, then tells the ingest worker to reload. */
  async apply(tankId: number, input: CalibrationApplyInput, userId: number, bus?: Bus): Promise<ApplyResult> {
    const fit = await this.fit(tankId, input);
    if (Math.abs(fit.formalPotentialV - input.expectedFormalPotentialV) > SAME_FIT_V) {
      throw AppError.conflict('The assays changed since this fit was shown: fit again before applying');
    }
    const version = await Tank.sequelize!.transaction(async (tx) => {
      const v = await repo.create({
        tankId, formalPotentialV: fit.formalPotentialV, formalCoeffVPerK: fit.formalCoeffVPerK, slopeEfficiency: fit.usedSlopeEfficiency,
        reason: input.reason, userId,
        fit: {
          from: new Date(input.from), to: new Date(input.to), n: fit.n, rmsMv: fit.rmsMv, slopeEfficiency: fit.slopeEfficiency,
          tempSpanC: fit.tempSpanC, fittedTempCoeff: fit.fittedTempCoeff, points: fit.points, excluded: fit.excluded,
        },
      }, tx);
      await writeAudit({
        userId, action: 'calibration.apply', entity: 'tank', entityId: tankId, reason: input.reason,
        before: fit.current && { version: fit.current.version, formalPotentialV: fit.current.formalPotentialV, formalCoeffVPerK: fit.current.formalCoeffVPerK },
        after: {
          version: v, formalPotentialV: fit.formalPotentialV, formalCoeffVPerK: fit.formalCoeffVPerK, slopeEfficiency: fit.usedSlopeEfficiency,
          n: fit.n, rmsMv: fit.rmsMv,
        },
      }, tx);
      return v;
    });
    await bus?.invalidateProbeCache().catch((err: Error) => logger.warn({ err: err.message, tankId }, 'could not announce the new calibration'));
    const calibration = (await repo.versions(tankId)).find((c) => c.version === version)!;
    return { calibration, fit };
  },

  /** Rewrites a period of readings with a chosen version; recorded in the audit log with the count. */
  async recompute(tankId: number, input: RecomputeInput, userId: number): Promise<RecomputeResult> {
    await requireTank(tankId);
    const cal = await repo.byVersion(tankId, input.version);
    if (!cal) throw AppError.notFound(`Calibration version ${input.version} of this tank`);
    const probes = await repo.probes(tankId);
    const fromMs = Date.parse(input.from);
    const toMs = Date.parse(input.to);
    const updated = await recomputeReadings(repo.rawPool(), probes, cal, fromMs, toMs, (n) => ({
      userId, action: 'calibration.recompute', entity: 'tank', entityId: tankId, reason: input.reason,
      after: { version: cal.version, from: input.from, to: input.to, readings: n },
    }));
    logger.info({ tankId, version: cal.version, updated }, 'readings recomputed');
    return { version: cal.version, updated, from: input.from, to: input.to };
  },
};
