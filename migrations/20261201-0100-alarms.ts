import type { QueryInterface } from 'sequelize';

/**
 * Alarm definitions, instances and their append-only history. Raw SQL because the guarantees
 * live in the schema:
 * - alarm_instances.open_definition_id is the definition id while the instance is open and
 *   NULL once closed; its UNIQUE key allows one open instance per definition, across processes.
 * - alarm_events is append-only: triggers refuse UPDATE and DELETE, so history is never rewritten.
 * - alarm_event_order holds one row that every event-writing transaction locks first: event ids
 *   then commit in id order, so a reader polling "id > last" can never skip a late commit.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE alarm_definitions (
    id INT AUTO_INCREMENT PRIMARY KEY,
    tank_id INT NOT NULL,
    kind VARCHAR(30) NOT NULL,
    priority TINYINT NOT NULL,
    threshold DOUBLE NULL COMMENT 'unit by kind; NULL for band kinds (band read live from tanks)',
    deadband DOUBLE NOT NULL DEFAULT 0 COMMENT 'percent of the limit for ratio kinds',
    on_delay_s INT NOT NULL DEFAULT 0,
    off_delay_s INT NOT NULL DEFAULT 0,
    window_s INT NULL,
    cause VARCHAR(1000) NOT NULL,
    consequence VARCHAR(1000) NOT NULL,
    action VARCHAR(1000) NOT NULL,
    response_min INT NOT NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    UNIQUE KEY uq_alarm_definitions_tank_kind (tank_id, kind),
    CONSTRAINT fk_alarm_definitions_tank FOREIGN KEY (tank_id) REFERENCES tanks(id),
    CONSTRAINT ck_alarm_definitions_priority CHECK (priority BETWEEN 1 AND 3)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE alarm_instances (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    definition_id INT NOT NULL,
    tank_id INT NOT NULL,
    priority TINYINT NOT NULL,
    state ENUM('normal','unacknowledged','acknowledged','rtn-unacknowledged','shelved','out-of-service','suppressed') NOT NULL,
    condition_active TINYINT(1) NOT NULL,
    open_definition_id INT NULL,
    opened_at DATETIME(3) NOT NULL,
    activated_at DATETIME(3) NULL COMMENT 'first annunciation',
    unack_since DATETIME(3) NULL COMMENT 'escalation clock; NULL once acknowledged or hidden',
    acked_at DATETIME(3) NULL,
    acked_by VARCHAR(120) NULL,
    closed_at DATETIME(3) NULL,
    shelved_until DATETIME(3) NULL,
    shelved_reason VARCHAR(500) NULL,
    shelved_by VARCHAR(120) NULL,
    oos_reason VARCHAR(500) NULL,
    first_value DOUBLE NULL,
    limit_value DOUBLE NULL,
    last_value DOUBLE NULL,
    last_value_at DATETIME(3) NULL,
    last_event_id BIGINT NOT NULL DEFAULT 0,
    UNIQUE KEY uq_alarm_instances_open (open_definition_id),
    KEY ix_alarm_instances_def (definition_id, id),
    KEY ix_alarm_instances_state (state, shelved_until),
    KEY ix_alarm_instances_opened (opened_at),
    CONSTRAINT fk_alarm_instances_def FOREIGN KEY (definition_id) REFERENCES alarm_definitions(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE alarm_events (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    instance_id BIGINT NOT NULL,
    definition_id INT NOT NULL,
    tank_id INT NOT NULL,
    at DATETIME(3) NOT NULL,
    kind VARCHAR(30) NOT NULL,
    from_state VARCHAR(20) NOT NULL,
    to_state VARCHAR(20) NOT NULL,
    condition_active TINYINT(1) NOT NULL,
    value DOUBLE NULL,
    limit_value DOUBLE NULL,
    by_user_id INT NULL,
    by_name VARCHAR(120) NULL,
    how ENUM('screen','email','automatic') NOT NULL,
    comment VARCHAR(1000) NULL,
    KEY ix_alarm_events_instance (instance_id, id),
    KEY ix_alarm_events_at (at),
    KEY ix_alarm_events_def_at (definition_id, at),
    CONSTRAINT fk_alarm_events_instance FOREIGN KEY (instance_id) REFERENCES alarm_instances(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TRIGGER alarm_events_no_update BEFORE UPDATE ON alarm_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'alarm_events is append-only'`);
  await q(`CREATE TRIGGER alarm_events_no_delete BEFORE DELETE ON alarm_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'alarm_events is append-only'`);
  await q('CREATE TABLE alarm_event_order (id TINYINT PRIMARY KEY) ENGINE=InnoDB');
  await q('INSERT INTO alarm_event_order (id) VALUES (1)');
  // Values other features feed to alarms: calibration drift (assays), last probe check (Calibration).
  await q(`CREATE TABLE alarm_inputs (
    tank_id INT PRIMARY KEY,
    calibration_drift_mv DOUBLE NULL,
    calibration_drift_at DATETIME(3) NULL,
    last_probe_check_at DATETIME(3) NULL,
    updated_at DATETIME(3) NOT NULL,
    CONSTRAINT fk_alarm_inputs_tank FOREIGN KEY (tank_id) REFERENCES tanks(id)
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['alarm_inputs', 'alarm_event_order', 'alarm_events', 'alarm_instances', 'alarm_definitions']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
