import type { QueryInterface } from 'sequelize';

/** Out of service ends on its own: the time it ends, read by the alarm timers. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('ALTER TABLE alarm_instances ADD COLUMN oos_until DATETIME(3) NULL AFTER oos_reason');
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('ALTER TABLE alarm_instances DROP COLUMN oos_until');
}
