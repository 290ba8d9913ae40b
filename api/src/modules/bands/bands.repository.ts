import { QueryTypes, type Transaction } from 'sequelize';
import type { BandChange, BandChangesQuery, BandValues } from '../../../../shared/schemas/bands.ts';
import { Tank } from '../../db/models.ts';
import { BandChangeRow, BandDecisionRow } from '../../db/workbench-models.ts';

type Row = {
  id: number; tank_id: number; tank_tag: string; old_low: number; old_high: number; old_target: number | null;
  new_low: number; new_high: number; new_target: number | null; reason: string; requested_by: number; requester: string;
  requested_at: Date; needs_approval: number; copied_from_tank_id: number | null;
  base_low: number | null; base_high: number | null; base_target: number | null; base_since: Date | null;
  decision: 'approved' | 'rejected' | 'withdrawn' | null; decided_by: number | null; decider: string | null; decided_at: Date | null; note: string | null;
};

const SELECT = `
  SELECT b.*, t.tag AS tank_tag, u.name AS requester, d.decision, d.decided_by, du.name AS decider, d.decided_at, d.note
    FROM band_changes b
    JOIN tanks t ON t.id = b.tank_id
    JOIN users u ON u.id = b.requested_by
    LEFT JOIN band_change_decisions d ON d.change_id = b.id
    LEFT JOIN users du ON du.id = d.decided_by`;

function toChange(r: Row): BandChange {
  const status = r.decision ?? (r.needs_approval ? 'pending' : 'applied');
  return {
    id: r.id, tankId: r.tank_id, tankTag: r.tank_tag,
    old: { low: r.old_low, high: r.old_high, target: r.old_target },
    new: { low: r.new_low, high: r.new_high, target: r.new_target },
    reason: r.reason, requestedBy: { id: r.requested_by, name: r.requester }, requestedAt: r.requested_at.toISOString(),
    needsApproval: Boolean(r.needs_approval), copiedFromTankId: r.copied_from_tank_id, status,
    cumulativeFrom: r.base_low !== null && r.base_high !== null && r.base_since
      ? { band: { low: r.base_low, high: r.base_high, target: r.base_target }, since: r.base_since.toISOString() }
      : null,
    decision: r.decision && r.decided_by !== null && r.decided_at
      ? { by: { id: r.decided_by, name: r.decider ?? '' }, at: r.decided_at.toISOString(), note: r.note }
      : null,
  };
}

export const bandsRepository = {
  async list(q: Partial<BandChangesQuery> & { ids?: number[] }, transaction?: Transaction): Promise<BandChange[]> {
    const where: string[] = [];
    if (q.tankId) where.push('b.tank_id = :tankId');
    if (q.ids) where.push(q.ids.length ? 'b.id IN (:ids)' : '1 = 0');
    if (q.status === 'pending') where.push('b.needs_approval = 1 AND d.id IS NULL');
    else if (q.status === 'applied') where.push('b.needs_approval = 0');
    else if (q.status) where.push('d.decision = :status');
    const sql = `${SELECT} ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY b.requested_at DESC, b.id DESC LIMIT :limit`;
    const rows = await Tank.sequelize!.query<Row>(sql, {
      replacements: { tankId: q.tankId ?? null, ids: q.ids ?? [], status: q.status ?? null, limit: q.limit ?? 100 },
      type: QueryTypes.SELECT, transaction,
    });
    return rows.map(toChange);
  },

  async get(id: number, transaction?: Transaction): Promise<BandChange | null> {
    return (await this.list({ ids: [id], limit: 1 }, transaction))[0] ?? null;
  },

  /** Locks the tank row, so two requests for one tank are decided one after the other. */
  async lockTank(tankId: number, transaction: Transaction): Promise<{ id: number; circuitId: number; band: BandValues } | null> {
    const t = await Tank.findByPk(tankId, { transaction, lock: transaction.LOCK.UPDATE });
    return t && { id: t.id, circuitId: t.circuitId, band: { low: t.bandLow, high: t.bandHigh, target: t.bandTarget } };
  },

  async pendingIdForTank(tankId: number, transaction: Transaction): Promise<number | null> {
    const rows = await Tank.sequelize!.query<{ id: number }>(
      `SELECT b.id FROM band_changes b LEFT JOIN band_change_decisions d ON d.change_id = b.id
        WHERE b.tank_id = :tankId AND b.needs_approval = 1 AND d.id IS NULL LIMIT 1`,
      { replacements: { tankId }, type: QueryTypes.SELECT, transaction },
    );
    return rows[0]?.id ?? null;
  },

  /**
   * The band in force at `since` for the steps that add up: the old band of the first change
   * that took effect at once after `since` and after the tank's last approved change (a second
   * person's approval starts the count afresh); null when no such change exists.
   */
  async bandAtWindowStart(tankId: number, since: Date, transaction: Transaction): Promise<{ band: BandValues; since: Date } | null> {
    const rows = await Tank.sequelize!.query<{ old_low: number; old_high: number; old_target: number | null; requested_at: Date }>(
      `SELECT b.old_low, b.old_high, b.old_target, b.requested_at FROM band_changes b
        WHERE b.tank_id = :tankId AND b.needs_approval = 0 AND b.requested_at >= :since
          AND b.requested_at > COALESCE((SELECT MAX(d.decided_at) FROM band_change_decisions d JOIN band_changes a ON a.id = d.change_id
                                          WHERE a.tank_id = :tankId AND d.decision = 'approved'), '1000-01-01')
        ORDER BY b.requested_at, b.id LIMIT 1`,
      { replacements: { tankId, since }, type: QueryTypes.SELECT, transaction },
    );
    const r = rows[0];
    return r ? { band: { low: r.old_low, high: r.old_high, target: r.old_target }, since: r.requested_at } : null;
  },

  async insert(input: {
    tankId: number; old: BandValues; next: BandValues; reason: string; userId: number; needsApproval: boolean; copiedFromTankId?: number;
    base?: { band: BandValues; since: Date } | null;
  }, transaction: Transaction): Promise<number> {
    const row = await BandChangeRow.create({
      tankId: input.tankId, oldLow: input.old.low, oldHigh: input.old.high, oldTarget: input.old.target,
      newLow: input.next.low, newHigh: input.next.high, newTarget: input.next.target, reason: input.reason,
      requestedBy: input.userId, requestedAt: new Date(), needsApproval: input.needsApproval, copiedFromTankId: input.copiedFromTankId ?? null,
      baseLow: input.base?.band.low ?? null, baseHigh: input.base?.band.high ?? null, baseTarget: input.base?.band.target ?? null,
      baseSince: input.base?.since ?? null,
    }, { transaction });
    return row.id;
  },

  async setTankBand(tankId: number, band: BandValues, transaction: Transaction): Promise<void> {
    await Tank.update({ bandLow: band.low, bandHigh: band.high, bandTarget: band.target }, { where: { id: tankId }, transaction });
  },

  async decide(changeId: number, decision: BandDecisionRow['decision'], userId: number, note: string | null, transaction: Transaction): Promise<void> {
    await BandDecisionRow.create({ changeId, decision, decidedBy: userId, decidedAt: new Date(), note }, { transaction });
  },

  /** Locks the change's tank first, then reads the change, so deciders queue on the tank. */
  async changeTankId(changeId: number, transaction: Transaction): Promise<number | null> {
    const row = await BandChangeRow.findByPk(changeId, { transaction, attributes: ['tankId'] });
    return row?.tankId ?? null;
  },
};
