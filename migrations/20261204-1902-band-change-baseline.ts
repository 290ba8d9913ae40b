import type { QueryInterface } from 'sequelize';

/**
 * Band changes add up: whether one needs a second person is judged against the band in force
 * at the start of the approval window (site setting, 24 h by default), not only against the
 * band just before it. The band it was judged against, and since when, is kept with the change
 * (NULL when that was simply the band before it), so a pending change shows the whole move.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(`ALTER TABLE band_changes
    ADD COLUMN base_low DOUBLE NULL, ADD COLUMN base_high DOUBLE NULL, ADD COLUMN base_target DOUBLE NULL,
    ADD COLUMN base_since DATETIME(3) NULL`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('ALTER TABLE band_changes DROP COLUMN base_low, DROP COLUMN base_high, DROP COLUMN base_target, DROP COLUMN base_since');
}
