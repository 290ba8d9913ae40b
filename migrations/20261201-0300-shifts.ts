import type { QueryInterface } from 'sequelize';

/**
 * Shifts with their handover, the shift log, and historical-import jobs with their rejected
 * rows. Times are UTC DATETIME(3). The shift pattern itself is a site setting (site_settings,
 * key 'shiftPattern', from the workbench migration), not a table of its own.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  // A row appears when a shift gets its first log entry or is closed; bounds are frozen then,
  // so a later pattern change never moves an already-recorded shift.
  await q(`CREATE TABLE shifts (
    id INT AUTO_INCREMENT PRIMARY KEY,
    site_id INT NOT NULL,
    starts_at DATETIME(3) NOT NULL,
    ends_at DATETIME(3) NOT NULL,
    closed_at DATETIME(3) NULL,
    closed_by INT NULL,
    handover_note TEXT NULL,
    created_at DATETIME(3) NOT NULL,
    UNIQUE KEY uq_shifts_site_start (site_id, starts_at),
    KEY ix_shifts_closed (site_id, closed_at),
    CONSTRAINT fk_shifts_site FOREIGN KEY (site_id) REFERENCES sites(id),
    CONSTRAINT fk_shifts_closed_by FOREIGN KEY (closed_by) REFERENCES users(id)
  ) ENGINE=InnoDB`);
  // alarm_id carries no foreign key: alarms live in another component's tables.
  await q(`CREATE TABLE shift_log_entries (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    shift_id INT NOT NULL,
    author_id INT NOT NULL,
    at DATETIME(3) NOT NULL,
    body TEXT NOT NULL,
    tank_id INT NULL,
    alarm_id BIGINT NULL,
    corrects_id BIGINT NULL,
    edited_at DATETIME(3) NULL,
    KEY ix_entries_shift (shift_id, at),
    CONSTRAINT fk_entries_shift FOREIGN KEY (shift_id) REFERENCES shifts(id),
    CONSTRAINT fk_entries_author FOREIGN KEY (author_id) REFERENCES users(id),
    CONSTRAINT fk_entries_tank FOREIGN KEY (tank_id) REFERENCES tanks(id),
    CONSTRAINT fk_entries_corrects FOREIGN KEY (corrects_id) REFERENCES shift_log_entries(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE import_jobs (
    id INT AUTO_INCREMENT PRIMARY KEY,
    file_name VARCHAR(255) NOT NULL,
    file_bytes BIGINT NOT NULL,
    status ENUM('queued','running','done','failed') NOT NULL,
    bytes_read BIGINT NOT NULL DEFAULT 0,
    rows_read INT NOT NULL DEFAULT 0,
    stored INT NOT NULL DEFAULT 0,
    duplicates INT NOT NULL DEFAULT 0,
    conflicts INT NOT NULL DEFAULT 0,
    rejected INT NOT NULL DEFAULT 0,
    error VARCHAR(1000) NULL,
    created_by INT NOT NULL,
    created_at DATETIME(3) NOT NULL,
    started_at DATETIME(3) NULL,
    finished_at DATETIME(3) NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT fk_import_jobs_user FOREIGN KEY (created_by) REFERENCES users(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE import_rejections (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    job_id INT NOT NULL,
    line INT NOT NULL,
    reason VARCHAR(500) NOT NULL,
    content VARCHAR(500) NOT NULL,
    KEY ix_import_rejections_job_line (job_id, line),
    CONSTRAINT fk_import_rejections_job FOREIGN KEY (job_id) REFERENCES import_jobs(id) ON DELETE CASCADE
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['import_rejections', 'import_jobs', 'shift_log_entries', 'shifts']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
