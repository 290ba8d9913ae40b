import { UniqueConstraintError } from 'sequelize';
import {
  toGramsPerLitre, type Assay, type AssayEntryInput, type AssaysQuery, type AssaysResponse,
} from '../../../../shared/schemas/assays.ts';
import { Tank } from '../../db/models.ts';
import { AppError } from '../../lib/app-error.ts';
import { writeAudit } from '../audit.repository.ts';
import { siteSettingsRepository } from '../site-settings/site-settings.repository.ts';
import { NO_MATCH, labRatioOf, matchAssays } from './assay-match.ts';
import { assaysRepository as repo, type StoredAssay } from './assays.repository.ts';

function toAssay(a: StoredAssay, match: Assay['match']): Assay {
  return {
    id: a.id, tankId: a.tankId, tankTag: a.tankTag, sampledAt: a.sampledAt.toISOString(),
    fe2GPerL: a.fe2GPerL, feTotalGPerL: a.feTotalGPerL, unit: a.unit, fe2Entered: a.fe2Entered, feTotalEntered: a.feTotalEntered,
    labRatio: labRatioOf(a.fe2GPerL, a.feTotalGPerL), method: a.method, analyst: a.analyst, labRef: a.labRef, note: a.note,
    source: a.source, createdBy: { id: a.createdBy, name: a.creatorName }, createdAt: a.createdAt.toISOString(),
    retracted: a.retractedAt ? { at: a.retractedAt.toISOString(), by: a.retractedBy ?? 0, reason: a.retractReason ?? '' } : null,
    match,
  };
}

/** Stored assays with their probe match; the window is the tank's site setting (or the first tank's, for a mixed list). */
async function withMatches(stored: StoredAssay[], windowMin: number): Promise<Assay[]> {
  const live = stored.filter((a) => !a.retractedAt);
  const matches = await matchAssays(live.map((a) => ({ id: a.id, labRatio: labRatioOf(a.fe2GPerL, a.feTotalGPerL) })), windowMin);
  return stored.map((a) => toAssay(a, matches.get(a.id) ?? NO_MATCH));
}

export const assaysService = {
  async list(q: AssaysQuery): Promise<AssaysResponse> {
    const stored = await repo.list(q);
    const tankId = q.tankId ?? stored[0]?.tankId;
    const windowMin = tankId ? (await siteSettingsRepository.forTank(tankId)).assayMatchWindowMin : 10;
    return { assays: await withMatches(stored, windowMin), windowMin };
  },

  /** Live assays of one tank in a period, each matched to the readings, for calibration fits. */
  async forTank(tankId: number, from: Date, to: Date): Promise<Assay[]> {
    const { assayMatchWindowMin } = await siteSettingsRepository.forTank(tankId);
    const stored = await repo.list({ tankId, from: from.toISOString(), to: to.toISOString(), liveOnly: true, limit: 2000 });
    return withMatches(stored, assayMatchWindowMin);
  },

  async create(input: AssayEntryInput, userId: number): Promise<Assay> {
    if (!(await Tank.findByPk(input.tankId, { attributes: ['id'] }))) throw AppError.notFound('Tank');
    const row = {
      tankId: input.tankId, sampledAt: new Date(input.sampledAt), unit: input.unit, fe2Entered: input.fe2, feTotalEntered: input.feTotal,
      fe2GPerL: toGramsPerLitre(input.fe2, input.unit), feTotalGPerL: toGramsPerLitre(input.feTotal, input.unit),
      method: input.method ?? null, analyst: input.analyst ?? null, labRef: input.labRef ?? null, note: input.note ?? null,
    };
    try {
      const [id] = await Tank.sequelize!.transaction(async (tx) => {
        const ids = await repo.insertMany([row], { source: 'form', userId }, tx);
        await writeAudit({ userId, action: 'assay.create', entity: 'assay', entityId: ids[0], after: { ...row, sampledAt: input.sampledAt } }, tx);
        return ids;
      });
      return (await this.byIds([id]))[0];
    } catch (err) {
      if (err instanceof UniqueConstraintError) throw AppError.conflict('An assay for this tank at this sampling time is already stored');
      throw err;
    }
  },

  async byIds(ids: number[]): Promise<Assay[]> {
    const stored = await repo.list({ ids, includeRetracted: true, limit: ids.length });
    const windowMin = stored[0] ? (await siteSettingsRepository.forTank(stored[0].tankId)).assayMatchWindowMin : 10;
    return withMatches(stored, windowMin);
  },

  async retract(id: number, reason: string, userId: number): Promise<Assay> {
    if (!(await repo.exists(id))) throw AppError.notFound('Assay');
    await Tank.sequelize!.transaction(async (tx) => {
      if (!(await repo.retract(id, userId, reason, tx))) throw AppError.conflict('This assay is already retracted');
      await writeAudit({ userId, action: 'assay.retract', entity: 'assay', entityId: id, reason }, tx);
    });
    return (await this.byIds([id]))[0];
  },

  /**
   * For the calibration-drift alarm: probe minus lab in mV for the newest assay of the tank that
   * has both a usable lab ratio and probe readings around its sampling time; null when none has.
   */
  async latestAssayDriftMv(tankId: number): Promise<number | null> {
    return (await this.latestAssayDrift(tankId))?.driftMv ?? null;
  },

  /** The same, with the assay it came from (for the alarm's message). */
  async latestAssayDrift(tankId: number): Promise<{ driftMv: number; assayId: number; sampledAt: string } | null> {
    const recent = await this.list({ tankId, includeRetracted: false, limit: 10 });
    const hit = recent.assays.find((a) => a.match.diffMv !== null);
    return hit ? { driftMv: hit.match.diffMv!, assayId: hit.id, sampledAt: hit.sampledAt } : null;
  },
};

/** For the calibration-drift alarm (see assaysService.latestAssayDrift for the assay it came from). */
export const latestAssayDriftMv = (tankId: number): Promise<number | null> => assaysService.latestAssayDriftMv(tankId);
