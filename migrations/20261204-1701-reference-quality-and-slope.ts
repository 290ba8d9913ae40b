import type { QueryInterface } from 'sequelize';

/**
 * Readings can say their reference electrode was outside the temperatures its source covers
 * (or above its usable temperature), or that their probe failed its last check ('probe-suspect');
 * a calibration version carries the slope efficiency the conversion uses (1 = the full Nernst
 * slope); a probe may carry its maker's table of reference potential against temperature; a
 * circuit says what process it runs (the Dose advisor's default oxidant follows it).
 * Appending ENUM values leaves existing rows as they are.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`ALTER TABLE readings MODIFY flag ENUM('ok','outside-range','reference-extrapolated','reference-unusable','probe-suspect') NOT NULL`);
  await q('ALTER TABLE calibrations ADD COLUMN slope_efficiency DOUBLE NOT NULL DEFAULT 1');
  await q('ALTER TABLE probes ADD COLUMN reference_table JSON NULL');
  await q("ALTER TABLE circuits ADD COLUMN process ENUM('bioleach','ferric-leach','other') NOT NULL DEFAULT 'other'");
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q('ALTER TABLE circuits DROP COLUMN process');
  await q('ALTER TABLE probes DROP COLUMN reference_table');
  await q('ALTER TABLE calibrations DROP COLUMN slope_efficiency');
  await q(`UPDATE readings SET flag = 'ok' WHERE flag IN ('reference-extrapolated','reference-unusable','probe-suspect')`);
  await q(`ALTER TABLE readings MODIFY flag ENUM('ok','outside-range') NOT NULL`);
}
