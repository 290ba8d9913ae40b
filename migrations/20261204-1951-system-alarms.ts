import type { QueryInterface } from 'sequelize';

/**
 * Plant-wide alarms: an alarm about Ferrisight itself (the ingest worker has stopped storing
 * readings) belongs to no tank, yet goes through the same lifecycle, escalation, acknowledge
 * links and history as a tank's. So tank_id may be NULL, and plant_kind (the kind of a
 * definition without a tank) keeps one definition per plant-wide kind.
 *
 * ingest_heartbeats: each ingest worker's liveness, beaten by the worker itself by the database
 * clock while it can take readings; a worker that stops cleanly marks its row stopped.
 */
const INGEST_STOPPED = {
  cause: 'The ingest worker has crashed, hangs or cannot reach the broker or the database, or keeps being restarted.',
  consequence: 'Readings are not being stored: tank values, trends and tank alarms go stale while devices keep sending.',
  action: 'Open Plant setup → Health to see the worker\'s state and last exit; check the database and broker; restart the worker or call the engineer on call.',
};

export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string, replacements?: unknown[]) => qi.sequelize.query(sql, { replacements });
  await q(`ALTER TABLE alarm_definitions MODIFY tank_id INT NULL,
    ADD COLUMN plant_kind VARCHAR(30) AS (CASE WHEN tank_id IS NULL THEN kind END) PERSISTENT,
    ADD UNIQUE KEY uq_alarm_definitions_plant_kind (plant_kind)`);
  await q('ALTER TABLE alarm_instances MODIFY tank_id INT NULL');
  await q('ALTER TABLE alarm_events MODIFY tank_id INT NULL');
  await q(`INSERT INTO alarm_definitions (tank_id, kind, priority, threshold, deadband, on_delay_s, off_delay_s, window_s, cause, consequence, action, response_min, created_at, updated_at)
    VALUES (NULL, 'ingest-stopped', 1, NULL, 0, 0, 0, NULL, ?, ?, ?, 15, UTC_TIMESTAMP(3), UTC_TIMESTAMP(3))`,
  [INGEST_STOPPED.cause, INGEST_STOPPED.consequence, INGEST_STOPPED.action]);
  await q(`CREATE TABLE ingest_heartbeats (
    worker VARCHAR(128) NOT NULL PRIMARY KEY,
    started_at DATETIME(3) NOT NULL,
    beat_at DATETIME(3) NOT NULL,
    stopped_at DATETIME(3) NULL COMMENT 'set by a clean stop: not watched until it beats again'
  ) ENGINE=InnoDB`);
}

/** Down removes the plant-wide alarms' history with them: alarm_events refuses DELETE, so its triggers are dropped and recreated around it. */
export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q('DROP TABLE IF EXISTS ingest_heartbeats');
  await q('DROP TRIGGER IF EXISTS alarm_events_no_delete');
  await q('DELETE FROM alarm_events WHERE tank_id IS NULL');
  await q(`CREATE TRIGGER alarm_events_no_delete BEFORE DELETE ON alarm_events FOR EACH ROW
    SIGNAL SQLSTATE '45000' SET MESSAGE_TEXT = 'alarm_events is append-only'`);
  await q('DELETE FROM alarm_ack_links WHERE instance_id IN (SELECT id FROM alarm_instances WHERE tank_id IS NULL)');
  await q('DELETE FROM mail_outbox WHERE instance_id IN (SELECT id FROM alarm_instances WHERE tank_id IS NULL)');
  await q('DELETE FROM alarm_instances WHERE tank_id IS NULL');
  await q('DELETE FROM alarm_definitions WHERE tank_id IS NULL');
  await q('ALTER TABLE alarm_events MODIFY tank_id INT NOT NULL');
  await q('ALTER TABLE alarm_instances MODIFY tank_id INT NOT NULL');
  await q('ALTER TABLE alarm_definitions DROP KEY uq_alarm_definitions_plant_kind, DROP COLUMN plant_kind, MODIFY tank_id INT NOT NULL');
}
