import { Op, QueryTypes, type Transaction } from 'sequelize';
import type { AssayUnit, AssaysQuery } from '../../../../shared/schemas/assays.ts';
import { Tank } from '../../db/models.ts';
import { AssayRow } from '../../db/workbench-models.ts';
import type { TankRef } from './csv-rows.ts';

export type NewAssay = {
  tankId: number; sampledAt: Date; fe2GPerL: number; feTotalGPerL: number; unit: AssayUnit; fe2Entered: number; feTotalEntered: number;
  method: string | null; analyst: string | null; labRef: string | null; note: string | null;
};

export type StoredAssay = NewAssay & {
  id: number; tankTag: string; source: string; createdBy: number; creatorName: string; createdAt: Date;
  retractedAt: Date | null; retractedBy: number | null; retractReason: string | null;
};

export type ReadingsNearAssay = { assayId: number; probeId: number; n: number; orpMv: number; tempC: number; lnRatio: number; calibrationVersion: number };

const CHUNK = 1000;

export const assaysRepository = {
  /** Tank tag (lower case) → id, tag and its site's time zone, for reading CSV rows. */
  async tankRefs(): Promise<Map<string, TankRef>> {
    const rows = await Tank.sequelize!.query<{ id: number; tag: string; tz: string }>(
      `SELECT t.id, t.tag, s.time_zone AS tz FROM tanks t JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id`,
      { type: QueryTypes.SELECT },
    );
    return new Map(rows.map((r) => [r.tag.toLowerCase(), { id: r.id, tag: r.tag, timeZone: r.tz }]));
  },

  /** 'tankId|epochMs' of live assays that share a tank and sampling time with the candidates. */
  async existingKeys(candidates: Array<{ tankId: number; sampledAtMs: number }>, transaction?: Transaction): Promise<Set<string>> {
    if (candidates.length === 0) return new Set();
    const times = candidates.map((c) => c.sampledAtMs);
    const rows = await AssayRow.findAll({
      attributes: ['tankId', 'sampledAt'],
      where: {
        tankId: [...new Set(candidates.map((c) => c.tankId))],
        sampledAt: { [Op.between]: [new Date(Math.min(...times)), new Date(Math.max(...times))] },
        liveKey: 1,
      },
      transaction,
    });
    return new Set(rows.map((r) => `${r.tankId}|${r.sampledAt.getTime()}`));
  },

  async insertMany(rows: NewAssay[], meta: { source: string; userId: number }, transaction: Transaction): Promise<number[]> {
    const ids: number[] = [];
    const createdAt = new Date();
    for (let i = 0; i < rows.length; i += CHUNK) {
      const made = await AssayRow.bulkCreate(
        rows.slice(i, i + CHUNK).map((r) => ({ ...r, source: meta.source, createdBy: meta.userId, createdAt })),
        { transaction },
      );
      ids.push(...made.map((m) => m.id));
    }
    return ids;
  },

  async list(q: Partial<AssaysQuery> & { ids?: number[]; liveOnly?: boolean }): Promise<StoredAssay[]> {
    const where: string[] = [];
    if (q.tankId) where.push('a.tank_id = :tankId');
    if (q.from) where.push('a.sampled_at >= :from');
    if (q.to) where.push('a.sampled_at <= :to');
    if (q.ids) where.push(q.ids.length ? 'a.id IN (:ids)' : '1 = 0');
    if (q.liveOnly ?? !q.includeRetracted) where.push('a.live_key = 1');
    const rows = await Tank.sequelize!.query<Record<string, unknown>>(
      `SELECT a.*, t.tag AS tank_tag, u.name AS creator FROM assays a JOIN tanks t ON t.id = a.tank_id JOIN users u ON u.id = a.created_by
        ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY a.sampled_at DESC, a.id DESC LIMIT :limit`,
      {
        replacements: { tankId: q.tankId ?? null, from: q.from ? new Date(q.from) : null, to: q.to ? new Date(q.to) : null, ids: q.ids ?? [], limit: q.limit ?? 200 },
        type: QueryTypes.SELECT,
      },
    );
    return rows.map((r) => ({
      id: r.id as number, tankId: r.tank_id as number, tankTag: r.tank_tag as string, sampledAt: r.sampled_at as Date,
      fe2GPerL: r.fe2_g_per_l as number, feTotalGPerL: r.fe_total_g_per_l as number, unit: r.unit as AssayUnit,
      fe2Entered: r.fe2_entered as number, feTotalEntered: r.fe_total_entered as number,
      method: r.method as string | null, analyst: r.analyst as string | null, labRef: r.lab_ref as string | null, note: r.note as string | null,
      source: r.source as string, createdBy: r.created_by as number, creatorName: r.creator as string, createdAt: r.created_at as Date,
      retractedAt: r.retracted_at as Date | null, retractedBy: r.retracted_by as number | null, retractReason: r.retract_reason as string | null,
    }));
  },

  /** Marks an assay as withdrawn; the row stays, so the record shows what was once believed. */
  async retract(id: number, userId: number, reason: string, transaction: Transaction): Promise<boolean> {
    const [n] = await AssayRow.update(
      { liveKey: null, retractedAt: new Date(), retractedBy: userId, retractReason: reason },
      { where: { id, liveKey: 1 }, transaction },
    );
    return n === 1;
  },

  async exists(id: number): Promise<boolean> {
    return (await AssayRow.count({ where: { id } })) > 0;
  },

  /**
   * Per assay and probe, the tank's readings within ±windowMin of the sampling time: how many,
   * mean ORP and temperature, mean ln(ratio) and the highest calibration version among them.
   */
  async readingsNearAssays(assayIds: number[], windowMin: number): Promise<ReadingsNearAssay[]> {
    if (assayIds.length === 0) return [];
    const rows = await Tank.sequelize!.query<{ assay_id: number; probe_id: number; n: number; orp: number; temp: number; ln_ratio: number; cv: number }>(
      `SELECT a.id AS assay_id, r.probe_id, COUNT(*) AS n, AVG(r.orp_mv) AS orp, AVG(r.temp_c) AS temp,
              AVG(LN(r.ratio)) AS ln_ratio, MAX(r.calibration_version) AS cv
         FROM assays a
         JOIN probes p ON p.tank_id = a.tank_id
         JOIN readings r ON r.probe_id = p.id
          AND r.ts BETWEEN a.sampled_at - INTERVAL :us MICROSECOND AND a.sampled_at + INTERVAL :us MICROSECOND
        WHERE a.id IN (:ids)
        GROUP BY a.id, r.probe_id`,
      { replacements: { ids: assayIds, us: Math.round(windowMin * 60e6) }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({
      assayId: r.assay_id, probeId: r.probe_id, n: Number(r.n), orpMv: Number(r.orp), tempC: Number(r.temp),
      lnRatio: Number(r.ln_ratio), calibrationVersion: Number(r.cv),
    }));
  },
};
