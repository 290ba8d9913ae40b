import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes,
  type InferCreationAttributes, type Sequelize,
} from 'sequelize';
import type { Role } from '../../../shared/schemas/auth.ts';
import { initWorkbenchModels } from './workbench-models.ts';
import type { CircuitProcess } from '../../../shared/schemas/plant.ts';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare passwordHash: string;
  declare disabled: CreationOptional<boolean>;
  declare tokensValidAfter: Date;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: CreationOptional<number>;
  declare tag: string;
  declare name: string;
  declare timeZone: CreationOptional<string>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Circuit extends Model<InferAttributes<Circuit>, InferCreationAttributes<Circuit>> {
  declare id: CreationOptional<number>;
  declare siteId: ForeignKey<Site['id']>;
  declare tag: string;
  declare name: string;
  declare position: number;
  /** What the circuit runs; the Dose advisor's default oxidant follows it. */
  declare process: CreationOptional<CircuitProcess>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Tank extends Model<InferAttributes<Tank>, InferCreationAttributes<Tank>> {
  declare id: CreationOptional<number>;
  declare circuitId: ForeignKey<Circuit['id']>;
  declare tag: string;
  declare name: string;
  declare position: number;
  declare volumeM3: number;
  declare bandLow: number;
  declare bandHigh: number;
  declare bandTarget: number | null;
  declare offline: CreationOptional<boolean>;
  declare feTotalGPerL: CreationOptional<number | null>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Calibration extends Model<InferAttributes<Calibration>, InferCreationAttributes<Calibration>> {
  declare id: CreationOptional<number>;
  declare tankId: ForeignKey<Tank['id']>;
  declare version: number;
  declare formalPotentialV: number;
  declare formalCoeffVPerK: number;
  /** Accepted slope efficiency the conversion uses; 1 = the full Nernst slope. */
  declare slopeEfficiency: CreationOptional<number>;
  declare validFrom: Date;
  declare reason: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
}

export class Probe extends Model<InferAttributes<Probe>, InferCreationAttributes<Probe>> {
  declare id: CreationOptional<number>;
  declare tankId: ForeignKey<Tank['id']>;
  declare tag: string;
  declare referenceId: string;
  declare referenceE25V: number;
  declare referenceCoeffVPerK: number;
  /** The maker's table of reference potential against temperature (JSON text), when entered. */
  declare referenceTable: CreationOptional<string | null>;
  declare toleranceMv: number;
  declare intervalS: number;
  declare installedAt: Date;
  declare active: CreationOptional<boolean>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Device extends Model<InferAttributes<Device>, InferCreationAttributes<Device>> {
  declare id: CreationOptional<number>;
  declare siteId: ForeignKey<Site['id']>;
  declare username: string;
  declare passwordHash: string;
  declare enabled: CreationOptional<boolean>;
  declare name: CreationOptional<string | null>;
  declare retiredAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<number>;
  declare at: Date;
  declare userId: number | null;
  declare action: string;
  declare entity: string;
  declare entityId: string | null;
  declare beforeJson: unknown;
  declare afterJson: unknown;
  declare reason: string | null;
}

const stamps = { createdAt: DataTypes.DATE(3), updatedAt: DataTypes.DATE(3) };

/** Registers every model and association on one Sequelize instance. */
export function initModels(sequelize: Sequelize): void {
  User.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('operator', 'supervisor', 'metallurgist', 'engineer', 'admin'), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: false },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    tokensValidAfter: { type: DataTypes.DATE(3), allowNull: false },
    ...stamps,
  }, { sequelize, tableName: 'users' });
  Site.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    timeZone: { type: DataTypes.STRING(64), allowNull: false, defaultValue: 'UTC' },
    retiredAt: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  }, { sequelize, tableName: 'sites' });
  Circuit.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tag: { type: DataTypes.STRING(40), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    process: { type: DataTypes.ENUM('bioleach', 'ferric-leach', 'other'), allowNull: false, defaultValue: 'other' },
    retiredAt: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  }, { sequelize, tableName: 'circuits' });
  Tank.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    volumeM3: { type: DataTypes.DOUBLE, allowNull: false },
    bandLow: { type: DataTypes.DOUBLE, allowNull: false },
    bandHigh: { type: DataTypes.DOUBLE, allowNull: false },
    bandTarget: { type: DataTypes.DOUBLE, allowNull: true },
    offline: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    feTotalGPerL: { type: DataTypes.DOUBLE, allowNull: true, field: 'fe_total_g_per_l' },
    retiredAt: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  }, { sequelize, tableName: 'tanks' });
  Calibration.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    version: { type: DataTypes.INTEGER, allowNull: false },
    formalPotentialV: { type: DataTypes.DOUBLE, allowNull: false },
    formalCoeffVPerK: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
    slopeEfficiency: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 1 },
    validFrom: { type: DataTypes.DATE(3), allowNull: false },
    reason: { type: DataTypes.STRING(500), allowNull: false },
    createdBy: { type: DataTypes.INTEGER, allowNull: true },
    createdAt: DataTypes.DATE(3),
  }, { sequelize, tableName: 'calibrations', updatedAt: false });
  Probe.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    tag: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    referenceId: { type: DataTypes.STRING(20), allowNull: false },
    referenceE25V: { type: DataTypes.DOUBLE, allowNull: false, field: 'reference_e25_v' },
    referenceCoeffVPerK: { type: DataTypes.DOUBLE, allowNull: false },
    referenceTable: { type: DataTypes.TEXT, allowNull: true },
    toleranceMv: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 10 },
    intervalS: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 5 },
    installedAt: { type: DataTypes.DATE(3), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    retiredAt: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  }, { sequelize, tableName: 'probes' });
  Device.init({
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    username: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    passwordHash: { type: DataTypes.STRING(100), allowNull: false },
    enabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    name: { type: DataTypes.STRING(120), allowNull: true },
    retiredAt: { type: DataTypes.DATE(3), allowNull: true },
    ...stamps,
  }, { sequelize, tableName: 'devices' });
  AuditEntry.init({
    id: { type: DataTypes.BIGINT, autoIncrement: true, primaryKey: true },
    at: { type: DataTypes.DATE(3), allowNull: false },
    userId: { type: DataTypes.INTEGER, allowNull: true },
    action: { type: DataTypes.STRING(60), allowNull: false },
    entity: { type: DataTypes.STRING(40), allowNull: false },
    entityId: { type: DataTypes.STRING(40), allowNull: true },
    beforeJson: { type: DataTypes.JSON, allowNull: true },
    afterJson: { type: DataTypes.JSON, allowNull: true },
    reason: { type: DataTypes.STRING(500), allowNull: true },
  }, { sequelize, tableName: 'audit_log', timestamps: false });

  Site.hasMany(Circuit, { foreignKey: 'siteId' });
  Circuit.belongsTo(Site, { foreignKey: 'siteId' });
  Circuit.hasMany(Tank, { foreignKey: 'circuitId' });
  Tank.belongsTo(Circuit, { foreignKey: 'circuitId' });
  Tank.hasMany(Probe, { foreignKey: 'tankId' });
  Probe.belongsTo(Tank, { foreignKey: 'tankId' });
  Tank.hasMany(Calibration, { foreignKey: 'tankId' });
  Calibration.belongsTo(Tank, { foreignKey: 'tankId' });
  Site.hasMany(Device, { foreignKey: 'siteId' });
  Device.belongsTo(Site, { foreignKey: 'siteId' });
  initWorkbenchModels(sequelize);
}
