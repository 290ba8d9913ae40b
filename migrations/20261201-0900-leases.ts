import type { QueryInterface } from 'sequelize';

/**
 * Leases: one row per job that must run on exactly one process of a cluster (escalation
 * mail, the alarm engine's timer, retention, the alarm feed's broadcaster). The holder
 * renews before expires_at; anyone may take an expired row. Times come from the database
 * clock (NOW(3)), so the nodes' own clocks never decide who holds a lease.
 * token goes up by one at every change of holder (a fencing token for the logs and for any
 * write that wants to refuse a stale holder); progress is the holder's work position
 * (e.g. the last alarm event id broadcast), so a successor resumes where it stopped.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(`CREATE TABLE leases (
    name VARCHAR(64) NOT NULL PRIMARY KEY,
    owner VARCHAR(128) NOT NULL,
    token BIGINT NOT NULL DEFAULT 0,
    expires_at DATETIME(3) NOT NULL,
    renewed_at DATETIME(3) NULL,
    progress BIGINT NULL
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('DROP TABLE IF EXISTS leases');
}
