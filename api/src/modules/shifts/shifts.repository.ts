import { QueryTypes, type Transaction } from 'sequelize';
import { z } from 'zod';
import { Site } from '../../db/models.ts';
import { toSqlTs } from '../../db/timestamps.ts';
import { SiteSetting } from '../../db/workbench-models.ts';
import { logger } from '../../lib/logger.ts';

export type SiteRow = { id: number; tag: string; name: string; timeZone: string };
export type PatternRow = { shiftsPerDay: 2 | 3; firstStartMin: number };
export type ShiftRow = {
  id: number; siteId: number; startsAt: Date; endsAt: Date; closedAt: Date | null;
  closedById: number | null; closedByName: string | null; handoverNote: string | null;
};

const PATTERN_KEY = 'shiftPattern';
const storedPatternSchema = z.object({
  shiftsPerDay: z.union([z.literal(2), z.literal(3)]),
  firstStartMin: z.number().int().min(0).max(1439),
});

const db = () => Site.sequelize!;
const select = <T extends object>(sql: string, replacements: Record<string, unknown>, transaction?: Transaction) =>
  db().query<T>(sql, { replacements, type: QueryTypes.SELECT, transaction });

const SHIFT_COLUMNS = `s.id, s.site_id AS siteId, s.starts_at AS startsAt, s.ends_at AS endsAt, s.closed_at AS closedAt,
  s.closed_by AS closedById, u.name AS closedByName, s.handover_note AS handoverNote`;

export const shiftsRepository = {
  /** The given site, or the first one when none is given. */
  async site(siteId?: number): Promise<SiteRow | null> {
    const rows = await select<SiteRow>(
      `SELECT id, tag, name, time_zone AS timeZone FROM sites ${siteId ? 'WHERE id = :siteId' : ''} ORDER BY id LIMIT 1`, { siteId });
    return rows[0] ?? null;
  },

  /** The saved pattern (site_settings key 'shiftPattern'); null when none or when the stored value is unusable. */
  async pattern(siteId: number): Promise<PatternRow | null> {
    const row = await SiteSetting.findOne({ where: { siteId, key: PATTERN_KEY } });
    const parsed = storedPatternSchema.safeParse(row?.value);
    if (row && !parsed.success) logger.warn({ siteId, value: row.value }, 'invalid shift pattern ignored, default used');
    return parsed.success ? parsed.data : null;
  },

  async savePattern(siteId: number, p: PatternRow, userId: number, transaction: Transaction): Promise<void> {
    await SiteSetting.upsert({ siteId, key: PATTERN_KEY, value: p, updatedBy: userId, updatedAt: new Date() }, { transaction });
  },

  /** Recorded shifts that overlap [fromMs, toMs). */
  rowsBetween(siteId: number, fromMs: number, toMs: number): Promise<ShiftRow[]> {
    return select<ShiftRow>(
      `SELECT ${SHIFT_COLUMNS} FROM shifts s LEFT JOIN users u ON u.id = s.closed_by
        WHERE s.site_id = :siteId AND s.starts_at < :to AND s.ends_at > :from ORDER BY s.starts_at`,
      { siteId, from: toSqlTs(fromMs), to: toSqlTs(toMs) });
  },

  async byStart(siteId: number, startsAtMs: number, transaction?: Transaction): Promise<ShiftRow | null> {
    const rows = await select<ShiftRow>(
      `SELECT ${SHIFT_COLUMNS} FROM shifts s LEFT JOIN users u ON u.id = s.closed_by
        WHERE s.site_id = :siteId AND s.starts_at = :start ${transaction ? 'FOR UPDATE' : ''}`,
      { siteId, start: toSqlTs(startsAtMs) }, transaction);
    return rows[0] ?? null;
  },

  async lastClosed(siteId: number): Promise<ShiftRow | null> {
    const rows = await select<ShiftRow>(
      `SELECT ${SHIFT_COLUMNS} FROM shifts s LEFT JOIN users u ON u.id = s.closed_by
        WHERE s.site_id = :siteId AND s.closed_at IS NOT NULL ORDER BY s.starts_at DESC LIMIT 1`, { siteId });
    return rows[0] ?? null;
  },

  /**
   * The shift's row, created with the given bounds when missing, locked until the transaction
   * ends: closing a shift and appending to it take the same lock, so no entry slips into a
   * shift after its handover.
   */
  async lockOrCreate(siteId: number, startsAtMs: number, endsAtMs: number, transaction: Transaction): Promise<ShiftRow> {
    await db().query(
      `INSERT INTO shifts (site_id, starts_at, ends_at, created_at) VALUES (:siteId, :start, :end, UTC_TIMESTAMP(3))
       ON DUPLICATE KEY UPDATE id = id`,
      { replacements: { siteId, start: toSqlTs(startsAtMs), end: toSqlTs(endsAtMs) }, transaction });
    return (await shiftsRepository.byStart(siteId, startsAtMs, transaction))!;
  },

  async close(id: number, userId: number, note: string, transaction: Transaction): Promise<void> {
    await db().query(
      'UPDATE shifts SET closed_at = UTC_TIMESTAMP(3), closed_by = :userId, handover_note = :note WHERE id = :id AND closed_at IS NULL',
      { replacements: { id, userId, note }, transaction });
  },
};
