import {
  DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize,
} from 'sequelize';

/** The metallurgist's workbench tables (migration 20261201-0200-workbench). */

export class SiteSetting extends Model<InferAttributes<SiteSetting>, InferCreationAttributes<SiteSetting>> {
  declare siteId: number;
  declare key: string;
  declare value: unknown;
  declare updatedBy: number | null;
  declare updatedAt: Date;
}

export class BandChangeRow extends Model<InferAttributes<BandChangeRow>, InferCreationAttributes<BandChangeRow>> {
  declare id: CreationOptional<number>;
  declare tankId: number;
  declare oldLow: number; declare oldHigh: number; declare oldTarget: number | null;
  declare newLow: number; declare newHigh: number; declare newTarget: number | null;
  declare reason: string;
  declare requestedBy: number;
  declare requestedAt: Date;
  declare needsApproval: boolean;
  declare copiedFromTankId: number | null;
  /** The band the change was judged against when earlier steps in the window add up (else null). */
  declare baseLow: CreationOptional<number | null>; declare baseHigh: CreationOptional<number | null>;
  declare baseTarget: CreationOptional<number | null>; declare baseSince: CreationOptional<Date | null>;
}

export class BandDecisionRow extends Model<InferAttributes<BandDecisionRow>, InferCreationAttributes<BandDecisionRow>> {
  declare id: CreationOptional<number>;
  declare changeId: number;
  declare decision: 'approved' | 'rejected' | 'withdrawn';
  declare decidedBy: number;
  declare decidedAt: Date;
  declare note: string | null;
}

export class AssayRow extends Model<InferAttributes<AssayRow>, InferCreationAttributes<AssayRow>> {
  declare id: CreationOptional<number>;
  declare tankId: number;
  declare sampledAt: Date;
  declare fe2GPerL: number;
  declare feTotalGPerL: number;
  declare unit: 'g/L' | 'mg/L' | 'mol/L';
  declare fe2Entered: number;
  declare feTotalEntered: number;
  declare method: string | null;
  declare analyst: string | null;
  declare labRef: string | null;
  declare note: string | null;
  declare source: string;
  declare createdBy: number;
  declare createdAt: Date;
  declare liveKey: CreationOptional<number | null>;
  declare retractedAt: CreationOptional<Date | null>;
  declare retractedBy: CreationOptional<number | null>;
  declare retractReason: CreationOptional<string | null>;
}

export class CalibrationFitRow extends Model<InferAttributes<CalibrationFitRow>, InferCreationAttributes<CalibrationFitRow>> {
  declare id: CreationOptional<number>;
  declare calibrationId: number;
  declare tankId: number;
  declare fromTs: Date;
  declare toTs: Date;
  declare n: number;
  declare rmsMv: number;
  declare slopeEfficiency: number | null;
  declare tempSpanC: number;
  declare fittedTempCoeff: boolean;
  declare pointsJson: unknown;
  declare excludedJson: unknown;
  declare createdAt: Date;
}

export class ProbeCheckRowModel extends Model<InferAttributes<ProbeCheckRowModel>, InferCreationAttributes<ProbeCheckRowModel>> {
  declare id: CreationOptional<number>;
  declare probeId: number;
  declare standard: 'zobell' | 'light';
  declare tempC: number;
  declare readingMv: number;
  declare toleranceMv: number;
  declare expectedMv: number;
  declare errorMv: number;
  declare pass: boolean;
  declare referenceE25V: number;
  declare referenceCoeffVPerK: number;
  declare checkedAt: Date;
  declare checkedBy: number;
  declare note: string | null;
}

export class ProbeScheduleRow extends Model<InferAttributes<ProbeScheduleRow>, InferCreationAttributes<ProbeScheduleRow>> {
  declare probeId: number;
  declare intervalDays: number;
  declare updatedBy: number;
  declare updatedAt: Date;
}

export class ProbeReplacementRowModel extends Model<InferAttributes<ProbeReplacementRowModel>, InferCreationAttributes<ProbeReplacementRowModel>> {
  declare id: CreationOptional<number>;
  declare probeId: number;
  declare part: 'whole' | 'reference' | 'sensing';
  declare replacedAt: Date;
  declare reason: string;
  declare note: string | null;
  declare createdBy: number;
  declare createdAt: Date;
}

// Factories, not shared objects: Sequelize writes field names into each attribute definition.
const id = () => ({ type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true });
const int = (allowNull = false) => ({ type: DataTypes.INTEGER, allowNull });
const dbl = (allowNull = false) => ({ type: DataTypes.DOUBLE, allowNull });
const date = (allowNull = false) => ({ type: DataTypes.DATE(3), allowNull });
const text = (n: number, allowNull = true) => ({ type: DataTypes.STRING(n), allowNull });
const bool = () => ({ type: DataTypes.BOOLEAN, allowNull: false });
// Timestamps are set explicitly (requested_at, checked_at, …): they are part of the record.
const opts = (sequelize: Sequelize, tableName: string) => ({ sequelize, tableName, timestamps: false });

/** Called from initModels, so every process that registers models gets these too. */
export function initWorkbenchModels(sequelize: Sequelize): void {
  SiteSetting.init({
    siteId: { type: DataTypes.INTEGER, primaryKey: true },
    key: { type: DataTypes.STRING(60), primaryKey: true, field: 'setting_key' },
    value: { type: DataTypes.JSON, allowNull: false, field: 'value_json' },
    updatedBy: int(true),
    updatedAt: date(),
  }, opts(sequelize, 'site_settings'));
  BandChangeRow.init({
    id: id(), tankId: int(), oldLow: dbl(), oldHigh: dbl(), oldTarget: dbl(true), newLow: dbl(), newHigh: dbl(), newTarget: dbl(true),
    reason: text(500, false), requestedBy: int(), requestedAt: date(), needsApproval: bool(), copiedFromTankId: int(true),
    baseLow: dbl(true), baseHigh: dbl(true), baseTarget: dbl(true), baseSince: date(true),
  }, opts(sequelize, 'band_changes'));
  BandDecisionRow.init({
    id: id(), changeId: int(), decision: { type: DataTypes.ENUM('approved', 'rejected', 'withdrawn'), allowNull: false },
    decidedBy: int(), decidedAt: date(), note: text(500),
  }, opts(sequelize, 'band_change_decisions'));
  AssayRow.init({
    id: id(), tankId: int(), sampledAt: date(), fe2GPerL: { ...dbl(), field: 'fe2_g_per_l' }, feTotalGPerL: dbl(),
    unit: { type: DataTypes.ENUM('g/L', 'mg/L', 'mol/L'), allowNull: false },
    fe2Entered: { ...dbl(), field: 'fe2_entered' }, feTotalEntered: dbl(),
    method: text(80), analyst: text(80), labRef: text(60), note: text(500), source: text(200, false),
    createdBy: int(), createdAt: date(), liveKey: { type: DataTypes.TINYINT, allowNull: true, defaultValue: 1 },
    retractedAt: date(true), retractedBy: int(true), retractReason: text(500),
  }, opts(sequelize, 'assays'));
  CalibrationFitRow.init({
    id: id(), calibrationId: int(), tankId: int(), fromTs: date(), toTs: date(), n: int(), rmsMv: dbl(), slopeEfficiency: dbl(true),
    tempSpanC: dbl(), fittedTempCoeff: bool(), pointsJson: { type: DataTypes.JSON, allowNull: false },
    excludedJson: { type: DataTypes.JSON, allowNull: false }, createdAt: date(),
  }, opts(sequelize, 'calibration_fits'));
  ProbeCheckRowModel.init({
    id: id(), probeId: int(), standard: { type: DataTypes.ENUM('zobell', 'light'), allowNull: false }, tempC: dbl(), readingMv: dbl(),
    toleranceMv: dbl(), expectedMv: dbl(), errorMv: dbl(), pass: bool(), referenceE25V: { ...dbl(), field: 'reference_e25_v' },
    referenceCoeffVPerK: dbl(), checkedAt: date(), checkedBy: int(), note: text(500),
  }, opts(sequelize, 'probe_checks'));
  ProbeScheduleRow.init({
    probeId: { type: DataTypes.INTEGER, primaryKey: true }, intervalDays: dbl(), updatedBy: int(), updatedAt: date(),
  }, opts(sequelize, 'probe_check_schedules'));
  ProbeReplacementRowModel.init({
    id: id(), probeId: int(), part: { type: DataTypes.ENUM('whole', 'reference', 'sensing'), allowNull: false }, replacedAt: date(),
    reason: text(500, false), note: text(500), createdBy: int(), createdAt: date(),
  }, opts(sequelize, 'probe_replacements'));
}
