import type { QueryInterface } from 'sequelize';

/**
 * Metallurgist's workbench: site settings, band change control, lab assays, calibration fits,
 * probe checks and the probe replacement log. Raw SQL, like the readings migration, because the
 * change record is append-only by design and the constraints say so more plainly than options.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE site_settings (
    site_id INT NOT NULL,
    setting_key VARCHAR(60) NOT NULL,
    value_json JSON NOT NULL,
    updated_by INT NULL,
    updated_at DATETIME(3) NOT NULL,
    PRIMARY KEY (site_id, setting_key),
    CONSTRAINT fk_site_settings_site FOREIGN KEY (site_id) REFERENCES sites(id)
  ) ENGINE=InnoDB`);
  // Management of change: a request row is never edited; its outcome is a separate decision row.
  await q(`CREATE TABLE band_changes (
    id INT AUTO_INCREMENT PRIMARY KEY,
    tank_id INT NOT NULL,
    old_low DOUBLE NOT NULL, old_high DOUBLE NOT NULL, old_target DOUBLE NULL,
    new_low DOUBLE NOT NULL, new_high DOUBLE NOT NULL, new_target DOUBLE NULL,
    reason VARCHAR(500) NOT NULL,
    requested_by INT NOT NULL,
    requested_at DATETIME(3) NOT NULL,
    needs_approval TINYINT(1) NOT NULL,
    copied_from_tank_id INT NULL,
    KEY ix_band_changes_tank (tank_id, requested_at),
    CONSTRAINT fk_band_changes_tank FOREIGN KEY (tank_id) REFERENCES tanks(id),
    CONSTRAINT fk_band_changes_user FOREIGN KEY (requested_by) REFERENCES users(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE band_change_decisions (
    id INT AUTO_INCREMENT PRIMARY KEY,
    change_id INT NOT NULL UNIQUE,
    decision ENUM('approved','rejected','withdrawn') NOT NULL,
    decided_by INT NOT NULL,
    decided_at DATETIME(3) NOT NULL,
    note VARCHAR(500) NULL,
    CONSTRAINT fk_band_decisions_change FOREIGN KEY (change_id) REFERENCES band_changes(id),
    CONSTRAINT fk_band_decisions_user FOREIGN KEY (decided_by) REFERENCES users(id)
  ) ENGINE=InnoDB`);
  // live_key is 1 while the assay counts and NULL once retracted: the unique key then lets a
  // corrected result be entered for the same tank and sampling time (NULLs never collide).
  await q(`CREATE TABLE assays (
    id INT AUTO_INCREMENT PRIMARY KEY,
    tank_id INT NOT NULL,
    sampled_at DATETIME(3) NOT NULL,
    fe2_g_per_l DOUBLE NOT NULL,
    fe_total_g_per_l DOUBLE NOT NULL,
    unit ENUM('g/L','mg/L','mol/L') NOT NULL,
    fe2_entered DOUBLE NOT NULL,
    fe_total_entered DOUBLE NOT NULL,
    method VARCHAR(80) NULL,
    analyst VARCHAR(80) NULL,
    lab_ref VARCHAR(60) NULL,
    note VARCHAR(500) NULL,
    source VARCHAR(200) NOT NULL,
    created_by INT NOT NULL,
    created_at DATETIME(3) NOT NULL,
    live_key TINYINT NULL DEFAULT 1,
    retracted_at DATETIME(3) NULL,
    retracted_by INT NULL,
    retract_reason VARCHAR(500) NULL,
    UNIQUE KEY ux_assays_tank_time (tank_id, sampled_at, live_key),
    KEY ix_assays_time (sampled_at),
    CONSTRAINT fk_assays_tank FOREIGN KEY (tank_id) REFERENCES tanks(id),
    CONSTRAINT fk_assays_user FOREIGN KEY (created_by) REFERENCES users(id)
  ) ENGINE=InnoDB`);
  // What an applied calibration was fitted from, so a version can be explained later.
  await q(`CREATE TABLE calibration_fits (
    id INT AUTO_INCREMENT PRIMARY KEY,
    calibration_id INT NOT NULL UNIQUE,
    tank_id INT NOT NULL,
    from_ts DATETIME(3) NOT NULL,
    to_ts DATETIME(3) NOT NULL,
    n INT NOT NULL,
    rms_mv DOUBLE NOT NULL,
    slope_efficiency DOUBLE NULL,
    temp_span_c DOUBLE NOT NULL,
    fitted_temp_coeff TINYINT(1) NOT NULL,
    points_json JSON NOT NULL,
    excluded_json JSON NOT NULL,
    created_at DATETIME(3) NOT NULL,
    CONSTRAINT fk_calibration_fits_cal FOREIGN KEY (calibration_id) REFERENCES calibrations(id)
  ) ENGINE=InnoDB`);
  // Reference values are copied onto each check: the probe record may be edited later.
  await q(`CREATE TABLE probe_checks (
    id INT AUTO_INCREMENT PRIMARY KEY,
    probe_id INT NOT NULL,
    standard ENUM('zobell','light') NOT NULL,
    temp_c DOUBLE NOT NULL,
    reading_mv DOUBLE NOT NULL,
    tolerance_mv DOUBLE NOT NULL,
    expected_mv DOUBLE NOT NULL,
    error_mv DOUBLE NOT NULL,
    pass TINYINT(1) NOT NULL,
    reference_e25_v DOUBLE NOT NULL,
    reference_coeff_v_per_k DOUBLE NOT NULL,
    checked_at DATETIME(3) NOT NULL,
    checked_by INT NOT NULL,
    note VARCHAR(500) NULL,
    KEY ix_probe_checks_probe (probe_id, checked_at),
    CONSTRAINT fk_probe_checks_probe FOREIGN KEY (probe_id) REFERENCES probes(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE probe_check_schedules (
    probe_id INT PRIMARY KEY,
    interval_days DOUBLE NOT NULL,
    updated_by INT NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT fk_probe_schedules_probe FOREIGN KEY (probe_id) REFERENCES probes(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE probe_replacements (
    id INT AUTO_INCREMENT PRIMARY KEY,
    probe_id INT NOT NULL,
    part ENUM('whole','reference','sensing') NOT NULL,
    replaced_at DATETIME(3) NOT NULL,
    reason VARCHAR(500) NOT NULL,
    note VARCHAR(500) NULL,
    created_by INT NOT NULL,
    created_at DATETIME(3) NOT NULL,
    KEY ix_probe_replacements_probe (probe_id, replaced_at),
    CONSTRAINT fk_probe_replacements_probe FOREIGN KEY (probe_id) REFERENCES probes(id)
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const tables = ['probe_replacements', 'probe_check_schedules', 'probe_checks', 'calibration_fits', 'assays',
    'band_change_decisions', 'band_changes', 'site_settings'];
  for (const t of tables) await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
}
