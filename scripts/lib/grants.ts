/**
 * Table-level privileges of the runtime database user (21 CFR 11.10(e): record changes shall
 * not obscure previously recorded information): migrations run as an owner account; the parts
 * (API, ingest, notifier) connect as the app user, which may only SELECT and INSERT audit and
 * history tables — an UPDATE or DELETE there is refused by MariaDB itself, whatever the
 * application code does.
 *
 * The list is by table name: a table added by a later migration gets ordinary read-write
 * rights until it is named here. tests/security/db-grants.test.ts fails when a table is in
 * neither list, so that choice is made on purpose.
 */

/** Records of what happened: written once, never changed or removed by the application. */
export const APPEND_ONLY_TABLES = [
  'audit_log',
  'alarm_events',
  'band_changes',
  'band_change_decisions',
  'calibrations',
  'calibration_fits',
  'probe_checks',
  'probe_replacements',
  'import_rejections',
  'sparkplug_events',
] as const;

/**
 * Kept for inspection and removed only by their retention setting: never rewritten, so INSERT
 * and DELETE but no UPDATE.
 */
export const RETAINED_TABLES = ['reading_conflicts', 'dead_letters'] as const;

/** Owned by the migrator; the application only reads them. */
export const READ_ONLY_TABLES = ['schema_migrations'] as const;

/** Tables the application updates or deletes from on purpose (state, queues, settings, raw data under retention). */
export const READ_WRITE_TABLES = [
  'users', 'sites', 'circuits', 'tanks', 'probes', 'devices', 'readings', 'rollups_1m', 'rollups_1h',
  'alarm_definitions', 'alarm_instances', 'alarm_event_order', 'alarm_inputs', 'roster_shifts', 'escalation_steps',
  'mail_outbox', 'alarm_ack_links', 'site_settings', 'assays', 'probe_check_schedules', 'shifts', 'shift_log_entries',
  'import_jobs', 'leases', 'setup_tokens', 'rate_limit_hits', 'sparkplug_groups', 'sparkplug_metrics', 'ingest_heartbeats',
] as const;

export type TablePrivileges = { table: string; privileges: string };

/** Runs one statement and returns the first column of each row (as text). */
export type SqlRunner = (sql: string) => Promise<string[]>;

const ident = (name: string) => `\`${name.replace(/`/g, '``')}\``;
const literal = (s: string) => `'${s.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`;

/** The privileges each table gets; every table not listed as append-only or read-only is read-write. */
export function planGrants(tables: string[]): TablePrivileges[] {
  const appendOnly = new Set<string>(APPEND_ONLY_TABLES);
  const readOnly = new Set<string>(READ_ONLY_TABLES);
  const retained = new Set<string>(RETAINED_TABLES);
  const privileges = (table: string) => {
    if (readOnly.has(table)) return 'SELECT';
    if (appendOnly.has(table)) return 'SELECT, INSERT';
    if (retained.has(table)) return 'SELECT, INSERT, DELETE';
    return 'SELECT, INSERT, UPDATE, DELETE';
  };
  return [...tables].sort().map((table) => ({ table, privileges: privileges(table) }));
}

/** Tables in neither list: each needs a decision (the security test lists them). */
export function unclassifiedTables(tables: string[]): string[] {
  const known = new Set<string>([...APPEND_ONLY_TABLES, ...RETAINED_TABLES, ...READ_ONLY_TABLES, ...READ_WRITE_TABLES]);
  return tables.filter((t) => !known.has(t)).sort();
}

/**
 * Replaces every privilege of `user` ('name'@'host', already created) with the table-level
 * plan for the tables of `database`. Run as an account holding GRANT OPTION (root over the
 * socket), after migrations, so new tables are covered. Idempotent.
 */
export async function syncAppGrants(run: SqlRunner, database: string, user: { name: string; host: string }): Promise<TablePrivileges[]> {
  const tables = await run(
    `SELECT table_name FROM information_schema.tables WHERE table_schema = ${literal(database)} AND table_type = 'BASE TABLE'`);
  const plan = planGrants(tables);
  const account = `${literal(user.name)}@${literal(user.host)}`;
  // Drops the database-wide ALL of earlier installations too; only the table grants below remain.
  await run(`REVOKE ALL PRIVILEGES, GRANT OPTION FROM ${account}`);
  for (const { table, privileges } of plan) {
    await run(`GRANT ${privileges} ON ${ident(database)}.${ident(table)} TO ${account}`);
  }
  return plan;
}
