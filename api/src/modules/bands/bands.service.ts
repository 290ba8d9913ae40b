import type { Transaction } from 'sequelize';
import {
  isLargeBandChange, type BandChange, type BandChangeInput, type BandChangesQuery, type BandCopyInput, type BandRow, type BandsResponse,
  type BandValues,
} from '../../../../shared/schemas/bands.ts';
import type { SessionUser } from '../../../../shared/schemas/auth.ts';
import { Tank } from '../../db/models.ts';
import { retryTransaction } from '../../lib/retry-transaction.ts';
import { AppError } from '../../lib/app-error.ts';
import { logger } from '../../lib/logger.ts';
import type { Bus } from '../../realtime/bus.ts';
import { writeAudit } from '../audit.repository.ts';
import { plantService } from '../plant/plant.service.ts';
import { siteSettingsRepository } from '../site-settings/site-settings.repository.ts';
import { bandAsMv, sameBand } from './band-mv.ts';
import { bandsRepository as repo } from './bands.repository.ts';

type Actor = Pick<SessionUser, 'id' | 'role'>;

/** The ingest worker and the alarm engine reload bands when told; a lost nudge is only logged. */
async function nudge(bus: Bus | undefined): Promise<void> {
  await bus?.invalidateProbeCache().catch((err: Error) => logger.warn({ err: err.message }, 'could not announce band change'));
}

/** One tank's change inside the caller's transaction: applied at once, or left pending approval. */
async function requestOne(
  tankId: number, next: BandValues, reason: string, actor: Actor, transaction: Transaction, copiedFromTankId?: number,
): Promise<{ id: number; applied: boolean } | null> {
  const tank = await repo.lockTank(tankId, transaction);
  if (!tank) throw AppError.notFound(`Tank ${tankId}`);
  const pending = await repo.pendingIdForTank(tankId, transaction);
  if (pending) throw AppError.conflict(`Tank ${tankId} has a band change awaiting approval (#${pending}): decide or withdraw it first`);
  if (sameBand(tank.band, next)) return null;
  const { bandApprovalFactor, bandApprovalWindowH } = await siteSettingsRepository.forTank(tankId, transaction);
  // Steps add up: small moves in a row are judged as the one move they make together.
  const base = await repo.bandAtWindowStart(tankId, new Date(Date.now() - bandApprovalWindowH * 3_600_000), transaction);
  const needsApproval = isLargeBandChange(tank.band, next, bandApprovalFactor) || (base !== null && isLargeBandChange(base.band, next, bandApprovalFactor));
  const id = await repo.insert({ tankId, old: tank.band, next, reason, userId: actor.id, needsApproval, copiedFromTankId, base }, transaction);
  if (!needsApproval) await repo.setTankBand(tankId, next, transaction);
  await writeAudit({
    userId: actor.id, action: needsApproval ? 'band.request' : 'band.change', entity: 'tank', entityId: tankId,
    before: tank.band, after: { ...next, changeId: id, ...(copiedFromTankId ? { copiedFromTankId } : {}) }, reason,
  }, transaction);
  return { id, applied: !needsApproval };
}

export const bandsService = {
  async list(): Promise<BandsResponse> {
    const [sites, pending] = await Promise.all([plantService.tree(), repo.list({ status: 'pending', limit: 500 })]);
    const tanks: BandRow[] = [];
    const approvalFactor: Record<number, number> = {};
    for (const s of sites) {
      approvalFactor[s.id] = (await siteSettingsRepository.forSite(s.id)).bandApprovalFactor;
      for (const c of s.circuits) {
        for (const t of c.tanks) {
          const { mv, note } = bandAsMv(t, t.band);
          tanks.push({
            tankId: t.id, tankTag: t.tag, tankName: t.name, circuitId: c.id, circuitTag: c.tag, circuitName: c.name, siteId: s.id,
            band: t.band, mv, mvNote: note, pending: pending.find((p) => p.tankId === t.id) ?? null,
          });
        }
      }
    }
    return { tanks, approvalFactor };
  },

  changes: (q: BandChangesQuery) => repo.list(q),

  async change(tankId: number, input: BandChangeInput, actor: Actor, bus?: Bus): Promise<BandChange> {
    const next = { low: input.low, high: input.high, target: input.target };
    const done = await retryTransaction(Tank.sequelize!, (tx) => requestOne(tankId, next, input.reason, actor, tx));
    if (!done) throw AppError.badRequest('The band is already set to these values');
    if (done.applied) await nudge(bus);
    return (await repo.get(done.id))!;
  },

  /** Copies a tank's band to other tanks of its circuit: all recorded, or none when one is refused. */
  async copy(fromTankId: number, input: BandCopyInput, actor: Actor, bus?: Bus): Promise<BandChange[]> {
    const ids = await Tank.sequelize!.transaction(async (tx) => {
      const source = await repo.lockTank(fromTankId, tx);
      if (!source) throw AppError.notFound('Tank');
      const out: number[] = [];
      // Ascending order: two copies over the same tanks lock them in the same order, so they queue instead of deadlocking.
      for (const tankId of [...new Set(input.tankIds)].filter((id) => id !== fromTankId).sort((a, b) => a - b)) {
        const target = await Tank.findByPk(tankId, { transaction: tx, attributes: ['id', 'circuitId'] });
        if (!target) throw AppError.notFound(`Tank ${tankId}`);
        if (target.circuitId !== source.circuitId) throw AppError.badRequest(`Tank ${tankId} is not in the same circuit`);
        const done = await requestOne(tankId, source.band, input.reason, actor, tx, fromTankId);
        if (done) out.push(done.id);
      }
      if (out.length === 0) throw AppError.badRequest('Every chosen tank already has this band');
      return out;
    });
    await nudge(bus);
    return repo.list({ ids, limit: ids.length });
  },

  /** A second person (not the requester) approves: only then does a large change take effect. */
  async decide(changeId: number, decision: 'approved' | 'rejected' | 'withdrawn', actor: Actor, note: string | null, bus?: Bus): Promise<BandChange> {
    await Tank.sequelize!.transaction(async (tx) => {
      const tankId = await repo.changeTankId(changeId, tx);
      if (!tankId) throw AppError.notFound('Band change');
      const tank = await repo.lockTank(tankId, tx);
      const change = await repo.get(changeId, tx);
      if (!tank || !change) throw AppError.notFound('Band change');
      if (change.status !== 'pending') throw AppError.conflict(`This change is ${change.status}, not awaiting approval`);
      const own = change.requestedBy.id === actor.id;
      if (decision === 'withdrawn' && !own) throw AppError.forbidden('Only the person who asked for the change can withdraw it');
      if (decision !== 'withdrawn' && own) throw AppError.forbidden('A second person must decide: you asked for this change');
      if (decision === 'approved') {
        if (!sameBand(tank.band, change.old)) throw AppError.conflict('The band has changed since this request: reject it and ask again');
        await repo.setTankBand(tankId, change.new, tx);
      }
      await repo.decide(changeId, decision, actor.id, note, tx);
      await writeAudit({
        userId: actor.id, action: `band.${decision === 'approved' ? 'approve' : decision === 'rejected' ? 'reject' : 'withdraw'}`,
        entity: 'tank', entityId: tankId, before: tank.band, after: decision === 'approved' ? { ...change.new, changeId } : { changeId },
        reason: note,
      }, tx);
    });
    if (decision === 'approved') await nudge(bus);
    return (await repo.get(changeId))!;
  },
};
