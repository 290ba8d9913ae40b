import type { QueryInterface } from 'sequelize';

/**
 * Hit counters of the sign-in limits (express-rate-limit and express-slow-down with a MariaDB
 * store), shared by every API node. k is the limiter's prefix plus a SHA-256 of its key, so no
 * e-mail address or client address is stored in clear; reset_at is judged by the database clock.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query(`CREATE TABLE rate_limit_hits (
    k VARCHAR(100) NOT NULL PRIMARY KEY,
    hits INT NOT NULL,
    reset_at DATETIME(3) NOT NULL,
    KEY ix_rate_limit_hits_reset (reset_at)
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  await qi.sequelize.query('DROP TABLE IF EXISTS rate_limit_hits');
}
