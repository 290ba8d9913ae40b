import type { QueryInterface } from 'sequelize';

/**
 * Readings and their side tables. Raw SQL: the primary key (probe_id, ts) is what makes
 * QoS 1 redelivery idempotent, and readings carry no foreign key so the table can be
 * partitioned by day later (partitioned tables cannot hold foreign keys).
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE devices (
    id INT AUTO_INCREMENT PRIMARY KEY,
    site_id INT NOT NULL,
    username VARCHAR(64) NOT NULL UNIQUE,
    password_hash VARCHAR(100) NOT NULL,
    enabled TINYINT(1) NOT NULL DEFAULT 1,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT fk_devices_site FOREIGN KEY (site_id) REFERENCES sites(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE readings (
    probe_id INT NOT NULL,
    ts DATETIME(3) NOT NULL,
    seq BIGINT NULL,
    orp_mv DOUBLE NOT NULL,
    temp_c DOUBLE NOT NULL,
    eh_v DOUBLE NOT NULL,
    ratio DOUBLE NOT NULL,
    ferric_fraction DOUBLE NOT NULL,
    flag ENUM('ok','outside-range') NOT NULL,
    calibration_version INT NOT NULL,
    received_at DATETIME(3) NOT NULL,
    PRIMARY KEY (probe_id, ts)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE reading_conflicts (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    probe_id INT NOT NULL,
    ts DATETIME(3) NOT NULL,
    stored_orp_mv DOUBLE NOT NULL,
    stored_temp_c DOUBLE NOT NULL,
    incoming_orp_mv DOUBLE NOT NULL,
    incoming_temp_c DOUBLE NOT NULL,
    incoming_seq BIGINT NULL,
    source VARCHAR(200) NOT NULL,
    received_at DATETIME(3) NOT NULL,
    KEY ix_conflicts_probe_ts (probe_id, ts)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE dead_letters (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    topic VARCHAR(300) NOT NULL,
    payload TEXT NOT NULL,
    payload_bytes INT NOT NULL,
    reason VARCHAR(1000) NOT NULL,
    received_at DATETIME(3) NOT NULL,
    KEY ix_dead_letters_received (received_at)
  ) ENGINE=InnoDB`);
  for (const [table, bucket] of [['rollups_1m', 'minute'], ['rollups_1h', 'hour']]) {
    await q(`CREATE TABLE ${table} (
      probe_id INT NOT NULL,
      bucket DATETIME NOT NULL COMMENT 'start of the ${bucket}, UTC',
      n INT NOT NULL,
      orp_min DOUBLE NOT NULL, orp_max DOUBLE NOT NULL, orp_mean DOUBLE NOT NULL,
      eh_min DOUBLE NOT NULL, eh_max DOUBLE NOT NULL, eh_mean DOUBLE NOT NULL,
      temp_min DOUBLE NOT NULL, temp_max DOUBLE NOT NULL, temp_mean DOUBLE NOT NULL,
      log_ratio_mean DOUBLE NOT NULL, log_ratio_min DOUBLE NOT NULL, log_ratio_max DOUBLE NOT NULL,
      PRIMARY KEY (probe_id, bucket)
    ) ENGINE=InnoDB`);
  }
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['rollups_1h', 'rollups_1m', 'dead_letters', 'reading_conflicts', 'readings', 'devices']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
