import type { Sequelize } from 'sequelize';

/**
 * Hooks for the features that feed alarms from outside the readings:
 * - the assays feature calls recordCalibrationDrift with the probe-minus-assay difference in mV
 *   (or AlarmEngine.raiseCalibrationDrift to evaluate at once, when it holds an engine);
 * - Calibration calls recordProbeCheck when a probe check against a standard solution passes.
 * The engine's tick (notifier process) evaluates calibration-drift and probe-check-overdue
 * definitions from these values within one tick.
 */
export async function recordCalibrationDrift(sequelize: Sequelize, tankId: number, diffMv: number, at = new Date()): Promise<void> {
  if (!Number.isFinite(diffMv)) throw new Error('diffMv must be a finite number of millivolts');
  await sequelize.query(
    `INSERT INTO alarm_inputs (tank_id, calibration_drift_mv, calibration_drift_at, updated_at) VALUES (?, ?, ?, ?)
     ON DUPLICATE KEY UPDATE calibration_drift_mv = VALUES(calibration_drift_mv), calibration_drift_at = VALUES(calibration_drift_at), updated_at = VALUES(updated_at)`,
    { replacements: [tankId, diffMv, at, at] });
}

export async function recordProbeCheck(sequelize: Sequelize, tankId: number, at = new Date()): Promise<void> {
  await sequelize.query(
    `INSERT INTO alarm_inputs (tank_id, last_probe_check_at, updated_at) VALUES (?, ?, ?)
     ON DUPLICATE KEY UPDATE last_probe_check_at = GREATEST(COALESCE(last_probe_check_at, VALUES(last_probe_check_at)), VALUES(last_probe_check_at)), updated_at = VALUES(updated_at)`,
    { replacements: [tankId, at, at] });
}
