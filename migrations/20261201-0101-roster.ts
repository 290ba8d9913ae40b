import type { QueryInterface } from 'sequelize';

/**
 * Call roster, escalation policy and the mail outbox.
 * - mail_outbox UNIQUE (instance_id, step): exactly one message per alarm and escalation step,
 *   whichever notifier process (or restart) gets there first.
 * - alarm_ack_links: one row per acknowledge link sent; used_at makes each link single-use.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE roster_shifts (
    id INT AUTO_INCREMENT PRIMARY KEY,
    person_name VARCHAR(120) NOT NULL,
    email VARCHAR(254) NOT NULL,
    role_on_call ENUM('primary','backup','supervisor') NOT NULL,
    starts_at DATETIME(3) NOT NULL,
    ends_at DATETIME(3) NOT NULL,
    note VARCHAR(300) NULL,
    created_by INT NULL,
    created_at DATETIME(3) NOT NULL,
    updated_at DATETIME(3) NOT NULL,
    KEY ix_roster_shifts_time (starts_at, ends_at)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE escalation_steps (
    priority TINYINT NOT NULL,
    step TINYINT NOT NULL,
    after_min INT NOT NULL,
    notify VARCHAR(60) NOT NULL COMMENT 'comma-separated on-call roles',
    PRIMARY KEY (priority, step)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE mail_outbox (
    id BIGINT AUTO_INCREMENT PRIMARY KEY,
    instance_id BIGINT NOT NULL,
    step TINYINT NOT NULL,
    recipients JSON NOT NULL,
    subject VARCHAR(300) NOT NULL,
    text_body MEDIUMTEXT NOT NULL,
    html_body MEDIUMTEXT NOT NULL,
    message_id VARCHAR(200) NOT NULL COMMENT 'stable per (instance, step), so a relay can spot a resend',
    status ENUM('pending','sending','sent','cancelled','no-recipient') NOT NULL,
    attempts INT NOT NULL DEFAULT 0,
    next_attempt_at DATETIME(3) NOT NULL,
    claimed_until DATETIME(3) NULL,
    last_error VARCHAR(1000) NULL,
    created_at DATETIME(3) NOT NULL,
    sent_at DATETIME(3) NULL,
    UNIQUE KEY uq_mail_outbox_instance_step (instance_id, step),
    KEY ix_mail_outbox_due (status, next_attempt_at),
    CONSTRAINT fk_mail_outbox_instance FOREIGN KEY (instance_id) REFERENCES alarm_instances(id)
  ) ENGINE=InnoDB`);
  await q(`CREATE TABLE alarm_ack_links (
    jti CHAR(32) PRIMARY KEY,
    outbox_id BIGINT NOT NULL,
    instance_id BIGINT NOT NULL,
    person_name VARCHAR(120) NOT NULL,
    email VARCHAR(254) NOT NULL,
    expires_at DATETIME(3) NOT NULL,
    used_at DATETIME(3) NULL,
    KEY ix_alarm_ack_links_instance (instance_id),
    CONSTRAINT fk_alarm_ack_links_outbox FOREIGN KEY (outbox_id) REFERENCES mail_outbox(id)
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['alarm_ack_links', 'mail_outbox', 'escalation_steps', 'roster_shifts']) {
    await qi.sequelize.query(`DROP TABLE IF EXISTS ${t}`);
  }
}
