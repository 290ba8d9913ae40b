import { DataTypes, type QueryInterface } from 'sequelize';

/** Users, plant structure, probes and the audit trail. */
export async function up({ context: qi }: { context: QueryInterface }): Promise<void> {
  const ts = { created_at: { type: DataTypes.DATE(3), allowNull: false }, updated_at: { type: DataTypes.DATE(3), allowNull: false } };
  await qi.createTable('users', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('operator', 'supervisor', 'metallurgist', 'engineer', 'admin'), allowNull: false },
    password_hash: { type: DataTypes.STRING(100), allowNull: false },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    // Tokens issued before this instant are refused: sign-out, password change and disabling all move it.
    tokens_valid_after: { type: DataTypes.DATE(3), allowNull: false },
    ...ts,
  });
  await qi.createTable('sites', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    time_zone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'UTC' },
    ...ts,
  });
  await qi.createTable('circuits', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    site_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'sites', key: 'id' } },
    tag: { type: DataTypes.STRING(40), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    ...ts,
  });
  await qi.addIndex('circuits', ['site_id', 'tag'], { unique: true });
  await qi.createTable('tanks', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    circuit_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'circuits', key: 'id' } },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    volume_m3: { type: DataTypes.DOUBLE, allowNull: false },
    band_low: { type: DataTypes.DOUBLE, allowNull: false },
    band_high: { type: DataTypes.DOUBLE, allowNull: false },
    band_target: { type: DataTypes.DOUBLE, allowNull: true },
    offline: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    ...ts,
  });
  // Formal potential per tank, versioned: readings keep the version they were converted with.
  await qi.createTable('calibrations', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tank_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'tanks', key: 'id' } },
    version: { type: DataTypes.INTEGER, allowNull: false },
    formal_potential_v: { type: DataTypes.DOUBLE, allowNull: false },
    formal_coeff_v_per_k: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    valid_from: { type: DataTypes.DATE(3), allowNull: false },
    reason: { type: DataTypes.STRING(500), allowNull: false },
    created_by: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
    created_at: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('calibrations', ['tank_id', 'version'], { unique: true });
  await qi.createTable('probes', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tank_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'tanks', key: 'id' } },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    reference_id: { type: DataTypes.STRING(20), allowNull: false },
    // Per-probe reference values: probe makers quote their own, and tables disagree by 2–4 mV.
    reference_e25_v: { type: DataTypes.DOUBLE, allowNull: false },
    reference_coeff_v_per_k: { type: DataTypes.DOUBLE, allowNull: false },
    tolerance_mv: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 10 },
    interval_s: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 5 },
    installed_at: { type: DataTypes.DATE(3), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...ts,
  });
  await qi.createTable('audit_log', {
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    at: { type: DataTypes.DATE(3), allowNull: false },
    user_id: { type: DataTypes.INTEGER, allowNull: true },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(40), allowNull: false },
    entity_id: { type: DataTypes.STRING(40), allowNull: true },
    before_json: { type: DataTypes.JSON, allowNull: true },
    after_json: { type: DataTypes.JSON, allowNull: true },
    reason: { type: DataTypes.STRING(500), allowNull: true },
  });
  await qi.addIndex('audit_log', ['entity', 'entity_id']);
}

export async function down({ context: qi }: { context: QueryInterface }): Promise<void> {
  for (const t of ['audit_log', 'probes', 'calibrations', 'tanks', 'circuits', 'sites', 'users']) await qi.dropTable(t);
}
