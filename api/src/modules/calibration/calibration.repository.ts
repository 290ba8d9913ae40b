import { QueryTypes, type Transaction } from 'sequelize';
import type { ReferenceElectrode } from '../../../../shared/redox/index.ts';
import type { CalibrationVersion } from '../../../../shared/schemas/calibration.ts';
import { rawPool } from '../../db/database.ts';
import { Calibration, Probe, Tank } from '../../db/models.ts';
import type { Pool } from '../../db/pool.ts';
import { CalibrationFitRow } from '../../db/workbench-models.ts';
import { referenceTableOf } from '../readings/probe-cache.ts';

type VersionRow = {
  version: number; formal_potential_v: number; formal_coeff_v_per_k: number; accepted_slope: number; valid_from: Date; reason: string;
  created_by: number | null; creator: string | null; n: number | null; rms_mv: number | null; slope_efficiency: number | null;
  from_ts: Date | null; to_ts: Date | null;
};

export type ProbeRef = { id: number; tag: string; active: boolean; referenceId: string; toleranceMv: number; reference: ReferenceElectrode };

export const calibrationRepository = {
  /** The raw pool, for rewriting readings through the readings repository (see recompute.ts). */
  rawPool: (): Pool => rawPool(Tank.sequelize!),

  /** Every version of a tank's calibration, newest first, with what each was fitted from. */
  async versions(tankId: number): Promise<CalibrationVersion[]> {
    const rows = await Tank.sequelize!.query<VersionRow>(
      `SELECT c.version, c.formal_potential_v, c.formal_coeff_v_per_k, c.slope_efficiency AS accepted_slope, c.valid_from, c.reason, c.created_by, u.name AS creator,
              f.n, f.rms_mv, f.slope_efficiency, f.from_ts, f.to_ts
         FROM calibrations c LEFT JOIN users u ON u.id = c.created_by LEFT JOIN calibration_fits f ON f.calibration_id = c.id
        WHERE c.tank_id = :tankId ORDER BY c.version DESC`,
      { replacements: { tankId }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({
      version: r.version, formalPotentialV: r.formal_potential_v, formalCoeffVPerK: r.formal_coeff_v_per_k, slopeEfficiency: r.accepted_slope,
      validFrom: r.valid_from.toISOString(), reason: r.reason,
      createdBy: r.created_by === null ? null : { id: r.created_by, name: r.creator ?? '' },
      fit: r.n === null || !r.from_ts || !r.to_ts ? null : {
        n: r.n, rmsMv: r.rms_mv ?? 0, slopeEfficiency: r.slope_efficiency, from: r.from_ts.toISOString(), to: r.to_ts.toISOString(),
      },
    }));
  },

  async tank(tankId: number): Promise<{ id: number; tag: string } | null> {
    const t = await Tank.findByPk(tankId, { attributes: ['id', 'tag'] });
    return t && { id: t.id, tag: t.tag };
  },

  /** All probes the tank has had (a matched reading may come from a probe since replaced). */
  async probes(tankId: number): Promise<ProbeRef[]> {
    const rows = await Probe.findAll({ where: { tankId }, order: [['active', 'DESC'], ['installedAt', 'DESC']] });
    return rows.map((p) => ({
      id: p.id, tag: p.tag, active: p.active, referenceId: p.referenceId, toleranceMv: p.toleranceMv,
      reference: {
        id: p.referenceId, label: p.referenceId, e25V: p.referenceE25V, coeffVPerK: p.referenceCoeffVPerK, source: `probe ${p.tag}`,
        ...referenceTableOf(p.referenceTable),
      },
    }));
  },

  async byVersion(tankId: number, version: number, transaction?: Transaction) {
    const c = await Calibration.findOne({ where: { tankId, version }, transaction });
    return c && { version: c.version, formalPotentialV: c.formalPotentialV, formalCoeffVPerK: c.formalCoeffVPerK, slopeEfficiency: c.slopeEfficiency };
  },

  /** New version = highest + 1, under a lock on the tank row so two applies cannot collide. */
  async create(input: {
    tankId: number; formalPotentialV: number; formalCoeffVPerK: number; slopeEfficiency: number; reason: string; userId: number;
    fit: { from: Date; to: Date; n: number; rmsMv: number; slopeEfficiency: number | null; tempSpanC: number; fittedTempCoeff: boolean; points: unknown; excluded: unknown };
  }, transaction: Transaction): Promise<number> {
    await Tank.findByPk(input.tankId, { transaction, lock: transaction.LOCK.UPDATE, attributes: ['id'] });
    const max = (await Calibration.max<number, Calibration>('version', { where: { tankId: input.tankId }, transaction })) ?? 0;
    const now = new Date();
    const cal = await Calibration.create({
      tankId: input.tankId, version: max + 1, formalPotentialV: input.formalPotentialV, formalCoeffVPerK: input.formalCoeffVPerK,
      slopeEfficiency: input.slopeEfficiency, validFrom: now, reason: input.reason, createdBy: input.userId,
    }, { transaction });
    const f = input.fit;
    await CalibrationFitRow.create({
      calibrationId: cal.id, tankId: input.tankId, fromTs: f.from, toTs: f.to, n: f.n, rmsMv: f.rmsMv, slopeEfficiency: f.slopeEfficiency,
      tempSpanC: f.tempSpanC, fittedTempCoeff: f.fittedTempCoeff, pointsJson: f.points, excludedJson: f.excluded, createdAt: now,
    }, { transaction });
    return max + 1;
  },
};
