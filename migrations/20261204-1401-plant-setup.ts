import type { QueryInterface } from 'sequelize';

/**
 * Plant setup and commissioning:
 * - what holds readings (sites, circuits, tanks, probes, gateways) is retired, never deleted;
 *   tanks get their usual total iron;
 * - a gateway has a display name next to its protocol-agnostic login (username);
 * - dead letters and conflicts carry a fingerprint (SHA-256 of what arrived), unique, so the
 *   same message again adds no second row; dead letters also keep who sent them, where they
 *   were aimed and a short reason kind, for filtering;
 * - one-time set-up tokens for creating the first admin of an empty database.
 */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const t of ['sites', 'circuits', 'tanks', 'probes', 'devices']) {
    await q(`ALTER TABLE ${t} ADD COLUMN retired_at DATETIME(3) NULL`);
  }
  await q('ALTER TABLE tanks ADD COLUMN fe_total_g_per_l DOUBLE NULL');
  await q('ALTER TABLE devices ADD COLUMN name VARCHAR(120) NULL');

  await q(`ALTER TABLE dead_letters
    ADD COLUMN fingerprint BINARY(32) NULL,
    ADD COLUMN gateway VARCHAR(64) NULL,
    ADD COLUMN site_tag VARCHAR(40) NULL,
    ADD COLUMN probe_tag VARCHAR(40) NULL,
    ADD COLUMN reason_kind VARCHAR(24) NOT NULL DEFAULT 'other'`);
  await q("UPDATE dead_letters SET fingerprint = UNHEX(SHA2(CONCAT(topic, CHAR(0), payload, CHAR(0), reason), 256))");
  await q('DELETE d1 FROM dead_letters d1 JOIN dead_letters d2 ON d1.fingerprint = d2.fingerprint AND d1.id > d2.id');
  await q(`ALTER TABLE dead_letters MODIFY fingerprint BINARY(32) NOT NULL,
    ADD UNIQUE KEY ux_dead_letters_fingerprint (fingerprint),
    ADD KEY ix_dead_letters_site (site_tag, received_at),
    ADD KEY ix_dead_letters_gateway (gateway, reason_kind)`);

  await q('ALTER TABLE reading_conflicts ADD COLUMN fingerprint BINARY(32) NULL');
  await q(`UPDATE reading_conflicts SET fingerprint = UNHEX(SHA2(CONCAT_WS(CHAR(0), probe_id, ts, incoming_orp_mv, incoming_temp_c, IFNULL(incoming_seq, '')), 256))`);
  await q('DELETE c1 FROM reading_conflicts c1 JOIN reading_conflicts c2 ON c1.fingerprint = c2.fingerprint AND c1.id > c2.id');
  await q(`ALTER TABLE reading_conflicts MODIFY fingerprint BINARY(32) NOT NULL,
    ADD UNIQUE KEY ux_reading_conflicts_fingerprint (fingerprint),
    ADD KEY ix_reading_conflicts_received (received_at)`);

  await q(`CREATE TABLE setup_tokens (
    token_sha256 BINARY(32) NOT NULL PRIMARY KEY,
    expires_at DATETIME(3) NOT NULL,
    used_at DATETIME(3) NULL,
    created_at DATETIME(3) NOT NULL
  ) ENGINE=InnoDB`);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q('DROP TABLE IF EXISTS setup_tokens');
  await q(`ALTER TABLE reading_conflicts DROP KEY ix_reading_conflicts_received, DROP KEY ux_reading_conflicts_fingerprint, DROP COLUMN fingerprint`);
  await q(`ALTER TABLE dead_letters DROP KEY ix_dead_letters_gateway, DROP KEY ix_dead_letters_site, DROP KEY ux_dead_letters_fingerprint,
    DROP COLUMN reason_kind, DROP COLUMN probe_tag, DROP COLUMN site_tag, DROP COLUMN gateway, DROP COLUMN fingerprint`);
  await q('ALTER TABLE devices DROP COLUMN name');
  await q('ALTER TABLE tanks DROP COLUMN fe_total_g_per_l');
  for (const t of ['devices', 'probes', 'tanks', 'circuits', 'sites']) await q(`ALTER TABLE ${t} DROP COLUMN retired_at`);
}
