import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { EscalationStepView, OnCallRole, ShiftInput, OnCallShiftView } from '../../../../shared/schemas/roster.ts';
import { Site } from '../../db/models.ts';

/** Roster shifts and escalation steps; raw SQL so the notifier process can use it without models. */
type ShiftRow = { id: number; person_name: string; email: string; role_on_call: OnCallRole; starts_at: Date; ends_at: Date; note: string | null; user_id: number | null };

const SHIFT_SELECT = `SELECT r.id, r.person_name, r.email, r.role_on_call, r.starts_at, r.ends_at, r.note, u.id AS user_id
  FROM roster_shifts r LEFT JOIN users u ON u.email = r.email AND u.disabled = 0`;

const toShift = (r: ShiftRow): OnCallShiftView => ({
  id: r.id, personName: r.person_name, email: r.email, roleOnCall: r.role_on_call, startsAt: new Date(r.starts_at).toISOString(),
  endsAt: new Date(r.ends_at).toISOString(), note: r.note, userId: r.user_id,
});

export const rosterRepository = {
  db: (): Sequelize => Site.sequelize!,

  /** Shifts overlapping [from, to), in time order. */
  async shifts(sequelize: Sequelize, from: Date, to: Date): Promise<OnCallShiftView[]> {
    const rows = await sequelize.query<ShiftRow>(`${SHIFT_SELECT} WHERE r.starts_at < :to AND r.ends_at > :from ORDER BY r.starts_at, r.role_on_call, r.id`,
      { replacements: { from, to }, type: QueryTypes.SELECT });
    return rows.map(toShift);
  },

  /** Who is on call at this instant. */
  onCall: (sequelize: Sequelize, at: Date) => rosterRepository.shifts(sequelize, at, new Date(at.getTime() + 1)),

  async get(sequelize: Sequelize, id: number, transaction?: Transaction): Promise<OnCallShiftView | null> {
    const [row] = await sequelize.query<ShiftRow>(`${SHIFT_SELECT} WHERE r.id = :id`, { replacements: { id }, type: QueryTypes.SELECT, transaction });
    return row ? toShift(row) : null;
  },

  async insert(sequelize: Sequelize, s: ShiftInput, userId: number | null, transaction?: Transaction): Promise<number> {
    const now = new Date();
    const [id] = await sequelize.query(
      `INSERT INTO roster_shifts (person_name, email, role_on_call, starts_at, ends_at, note, created_by, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      { replacements: [s.personName, s.email, s.roleOnCall, new Date(s.startsAt), new Date(s.endsAt), s.note ?? null, userId, now, now], type: QueryTypes.INSERT, transaction });
    return Number(id);
  },

  async update(sequelize: Sequelize, id: number, s: ShiftInput, transaction: Transaction): Promise<void> {
    await sequelize.query(
      'UPDATE roster_shifts SET person_name = ?, email = ?, role_on_call = ?, starts_at = ?, ends_at = ?, note = ?, updated_at = ? WHERE id = ?',
      { replacements: [s.personName, s.email, s.roleOnCall, new Date(s.startsAt), new Date(s.endsAt), s.note ?? null, new Date(), id], transaction });
  },

  async remove(sequelize: Sequelize, id: number, transaction: Transaction): Promise<void> {
    await sequelize.query('DELETE FROM roster_shifts WHERE id = ?', { replacements: [id], transaction });
  },

  async policy(sequelize: Sequelize, transaction?: Transaction): Promise<EscalationStepView[]> {
    const rows = await sequelize.query<{ priority: number; step: number; after_min: number; notify: string }>(
      'SELECT priority, step, after_min, notify FROM escalation_steps ORDER BY priority, step', { type: QueryTypes.SELECT, transaction });
    return rows.map((r) => ({ priority: r.priority, step: r.step, afterMin: r.after_min, notify: r.notify.split(',').filter(Boolean) as OnCallRole[] }));
  },

  /** Replaces one priority's steps (steps are numbered from 1 in time order). */
  async replacePolicy(sequelize: Sequelize, priority: number, steps: Array<{ afterMin: number; notify: OnCallRole[] }>, transaction?: Transaction): Promise<void> {
    await sequelize.query('DELETE FROM escalation_steps WHERE priority = ?', { replacements: [priority], transaction });
    for (const [i, s] of steps.entries()) {
      await sequelize.query('INSERT INTO escalation_steps (priority, step, after_min, notify) VALUES (?, ?, ?, ?)',
        { replacements: [priority, i + 1, s.afterMin, s.notify.join(',')], transaction });
    }
  },
};
