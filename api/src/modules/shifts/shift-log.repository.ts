import { QueryTypes, type Transaction } from 'sequelize';
import type { ShiftLogEntryView } from '../../../../shared/schemas/shifts.ts';
import { Site } from '../../db/models.ts';
import { toSqlTs } from '../../db/timestamps.ts';

type EntryRow = {
  id: number; shiftId: number; at: Date; authorId: number; authorName: string; authorRole: string; body: string;
  tankId: number | null; tankTag: string | null; alarmId: number | null; correctsId: number | null; editedAt: Date | null;
};

const ENTRY_SELECT = `SELECT e.id, e.shift_id AS shiftId, e.at, e.author_id AS authorId, u.name AS authorName, u.role AS authorRole,
    e.body, e.tank_id AS tankId, t.tag AS tankTag, e.alarm_id AS alarmId, e.corrects_id AS correctsId, e.edited_at AS editedAt
  FROM shift_log_entries e JOIN users u ON u.id = e.author_id LEFT JOIN tanks t ON t.id = e.tank_id`;

const db = () => Site.sequelize!;

function toView(r: EntryRow): ShiftLogEntryView {
  return {
    id: r.id, shiftId: r.shiftId, at: r.at.toISOString(), author: { id: r.authorId, name: r.authorName, role: r.authorRole },
    body: r.body, tank: r.tankId ? { id: r.tankId, tag: r.tankTag ?? '' } : null, alarmId: r.alarmId,
    correctsId: r.correctsId, editedAt: r.editedAt ? r.editedAt.toISOString() : null,
  };
}

export type EntryInsert = { shiftId: number; authorId: number; body: string; tankId: number | null; alarmId: number | null; correctsId: number | null };

/** Entries are appended; the only update is an author's edit while the shift is open (the service checks). */
export const shiftLogRepository = {
  async ofShift(shiftId: number): Promise<ShiftLogEntryView[]> {
    const rows = await db().query<EntryRow>(`${ENTRY_SELECT} WHERE e.shift_id = :shiftId ORDER BY e.at, e.id`,
      { replacements: { shiftId }, type: QueryTypes.SELECT });
    return rows.map(toView);
  },

  /** Entries of a site written in [fromMs, toMs), for the digest of a free range. */
  async between(siteId: number, fromMs: number, toMs: number): Promise<ShiftLogEntryView[]> {
    const rows = await db().query<EntryRow>(
      `${ENTRY_SELECT} JOIN shifts s ON s.id = e.shift_id WHERE s.site_id = :siteId AND e.at >= :from AND e.at < :to ORDER BY e.at, e.id`,
      { replacements: { siteId, from: toSqlTs(fromMs), to: toSqlTs(toMs) }, type: QueryTypes.SELECT });
    return rows.map(toView);
  },

  async byId(id: number, transaction?: Transaction): Promise<(ShiftLogEntryView & { siteId: number; shiftClosed: boolean }) | null> {
    const rows = await db().query<EntryRow & { siteId: number; closedAt: Date | null }>(
      `${ENTRY_SELECT.replace('FROM shift_log_entries e', ', s.site_id AS siteId, s.closed_at AS closedAt FROM shift_log_entries e JOIN shifts s ON s.id = e.shift_id')}
        WHERE e.id = :id ${transaction ? 'FOR UPDATE' : ''}`,
      { replacements: { id }, type: QueryTypes.SELECT, transaction });
    const r = rows[0];
    return r ? { ...toView(r), siteId: r.siteId, shiftClosed: r.closedAt !== null } : null;
  },

  async insert(e: EntryInsert, transaction: Transaction): Promise<number> {
    const [id] = await db().query(
      `INSERT INTO shift_log_entries (shift_id, author_id, at, body, tank_id, alarm_id, corrects_id)
       VALUES (:shiftId, :authorId, UTC_TIMESTAMP(3), :body, :tankId, :alarmId, :correctsId)`,
      { replacements: e, type: QueryTypes.INSERT, transaction });
    return Number(id);
  },

  async updateBody(id: number, body: string, transaction: Transaction): Promise<void> {
    await db().query('UPDATE shift_log_entries SET body = :body, edited_at = UTC_TIMESTAMP(3) WHERE id = :id',
      { replacements: { id, body }, transaction });
  },

  /**
   * False when the alarm is known not to exist on the site; true when it does, or when the
   * Alarm desk's tables are not there to ask (alarm_id has no foreign key for that reason).
   */
  async alarmOnSite(alarmId: number, siteId: number): Promise<boolean> {
    try {
      const rows = await db().query(
        `SELECT 1 AS ok FROM alarm_instances i JOIN tanks t ON t.id = i.tank_id JOIN circuits c ON c.id = t.circuit_id
          WHERE i.id = :alarmId AND c.site_id = :siteId`,
        { replacements: { alarmId, siteId }, type: QueryTypes.SELECT });
      return rows.length > 0;
    } catch (err) {
      if ((err as { original?: { errno?: number } }).original?.errno === 1146) return true;
      throw err;
    }
  },

  /** True when the tank belongs to the site (entries may only point at the site's own tanks). */
  async tankOnSite(tankId: number, siteId: number): Promise<boolean> {
    const rows = await db().query(
      'SELECT 1 AS ok FROM tanks t JOIN circuits c ON c.id = t.circuit_id WHERE t.id = :tankId AND c.site_id = :siteId',
      { replacements: { tankId, siteId }, type: QueryTypes.SELECT });
    return rows.length > 0;
  },
};
