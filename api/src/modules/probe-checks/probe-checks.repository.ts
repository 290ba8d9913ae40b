import { QueryTypes, type InferCreationAttributes, type Transaction } from 'sequelize';
import type { ProbeCheckRow, ProbeReplacementRow } from '../../../../shared/schemas/probe-checks.ts';
import type { ReadingFlag } from '../../../../shared/redox/index.ts';
import type { TankLive } from '../../../../shared/schemas/readings.ts';
import { Probe } from '../../db/models.ts';
import { ProbeCheckRowModel, ProbeReplacementRowModel, ProbeScheduleRow } from '../../db/workbench-models.ts';

export type ProbeFacts = {
  id: number; tag: string; tankId: number; tankTag: string; installedAt: Date; active: boolean;
  referenceId: string; referenceE25V: number; referenceCoeffVPerK: number; referenceTable: string | null; toleranceMv: number;
};

const q = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
  Probe.sequelize!.query<T>(sql, { replacements, type: QueryTypes.SELECT });

export const probeChecksRepository = {
  async probes(where: { id?: number } = {}): Promise<ProbeFacts[]> {
    const rows = await q<Record<string, unknown>>(
      `SELECT p.*, t.tag AS tank_tag FROM probes p JOIN tanks t ON t.id = p.tank_id
        ${where.id ? 'WHERE p.id = :id' : 'WHERE p.active = 1'} ORDER BY t.circuit_id, t.position, p.tag`, { id: where.id ?? null },
    );
    return rows.map((r) => ({
      id: r.id as number, tag: r.tag as string, tankId: r.tank_id as number, tankTag: r.tank_tag as string, installedAt: r.installed_at as Date,
      active: Boolean(r.active), referenceId: r.reference_id as string, referenceE25V: r.reference_e25_v as number,
      referenceCoeffVPerK: r.reference_coeff_v_per_k as number, referenceTable: (r.reference_table as string | null) ?? null,
      toleranceMv: r.tolerance_mv as number,
    }));
  },

  async insertCheck(row: Omit<InferCreationAttributes<ProbeCheckRowModel>, 'id'>, transaction: Transaction): Promise<number> {
    return (await ProbeCheckRowModel.create(row, { transaction })).id;
  },

  async checks(filter: { probeId?: number; ids?: number[]; limit: number }): Promise<ProbeCheckRow[]> {
    const where = [filter.probeId ? 'c.probe_id = :probeId' : '1 = 1', filter.ids ? 'c.id IN (:ids)' : '1 = 1'];
    const rows = await q<Record<string, unknown>>(
      `SELECT c.*, p.tag AS probe_tag, u.name AS checker FROM probe_checks c JOIN probes p ON p.id = c.probe_id JOIN users u ON u.id = c.checked_by
        WHERE ${where.join(' AND ')} ORDER BY c.checked_at DESC, c.id DESC LIMIT :limit`,
      { probeId: filter.probeId ?? null, ids: filter.ids ?? [], limit: filter.limit },
    );
    return rows.map((r) => ({
      id: r.id as number, probeId: r.probe_id as number, probeTag: r.probe_tag as string, standard: r.standard as ProbeCheckRow['standard'],
      tempC: r.temp_c as number, readingMv: r.reading_mv as number, toleranceMv: r.tolerance_mv as number, expectedMv: r.expected_mv as number,
      errorMv: r.error_mv as number, pass: Boolean(r.pass), checkedAt: (r.checked_at as Date).toISOString(),
      checkedBy: { id: r.checked_by as number, name: r.checker as string }, note: r.note as string | null,
    }));
  },

  /** Newest check, newest passed check and newest replacement per probe. */
  async history(): Promise<Map<number, { last?: { at: Date; pass: boolean; errorMv: number }; lastPass?: Date; lastReplacement?: Date }>> {
    const out = new Map<number, { last?: { at: Date; pass: boolean; errorMv: number }; lastPass?: Date; lastReplacement?: Date }>();
    const get = (id: number) => out.get(id) ?? out.set(id, {}).get(id)!;
    const last = await q<{ probe_id: number; checked_at: Date; pass: number; error_mv: number }>(
      `SELECT c.probe_id, c.checked_at, c.pass, c.error_mv FROM probe_checks c
        WHERE c.id = (SELECT c2.id FROM probe_checks c2 WHERE c2.probe_id = c.probe_id ORDER BY c2.checked_at DESC, c2.id DESC LIMIT 1)`);
    for (const r of last) get(r.probe_id).last = { at: r.checked_at, pass: Boolean(r.pass), errorMv: r.error_mv };
    for (const r of await q<{ probe_id: number; at: Date }>('SELECT probe_id, MAX(checked_at) AS at FROM probe_checks WHERE pass = 1 GROUP BY probe_id')) {
      get(r.probe_id).lastPass = r.at;
    }
    for (const r of await q<{ probe_id: number; at: Date }>('SELECT probe_id, MAX(replaced_at) AS at FROM probe_replacements GROUP BY probe_id')) {
      get(r.probe_id).lastReplacement = r.at;
    }
    return out;
  },

  /**
   * Marks the probe's newest stored reading suspect (unless something worse is already flagged)
   * and returns it as the screens show it, so a failed check shows at once, not one reading later.
   */
  async markLatestSuspect(probeId: number): Promise<{ siteTag: string; reading: TankLive } | null> {
    await Probe.sequelize!.query(
      `UPDATE readings SET flag = 'probe-suspect'
        WHERE probe_id = :probeId AND flag IN ('ok', 'reference-extrapolated')
          AND ts = (SELECT newest FROM (SELECT MAX(ts) AS newest FROM readings WHERE probe_id = :probeId) AS m)`,
      { replacements: { probeId } },
    );
    const [r] = await q<{
      tank_id: number; tag: string; site_tag: string; ts: Date; orp_mv: number; temp_c: number; eh_v: number; ratio: number;
      ferric_fraction: number; flag: ReadingFlag; calibration_version: number;
    }>(
      `SELECT p.tank_id, p.tag, s.tag AS site_tag, r.ts, r.orp_mv, r.temp_c, r.eh_v, r.ratio, r.ferric_fraction, r.flag, r.calibration_version
         FROM readings r JOIN probes p ON p.id = r.probe_id JOIN tanks t ON t.id = p.tank_id JOIN circuits c ON c.id = t.circuit_id
         JOIN sites s ON s.id = c.site_id
        WHERE r.probe_id = :probeId ORDER BY r.ts DESC LIMIT 1`, { probeId },
    );
    return r ? {
      siteTag: r.site_tag,
      reading: {
        tankId: r.tank_id, probeId, probeTag: r.tag, ts: r.ts.toISOString(), orpMv: r.orp_mv, tempC: r.temp_c, ehV: r.eh_v, ratio: r.ratio,
        ferricFraction: r.ferric_fraction, flag: r.flag, calibrationVersion: r.calibration_version,
      },
    } : null;
  },

  async schedules(): Promise<Map<number, number>> {
    return new Map((await ProbeScheduleRow.findAll()).map((s) => [s.probeId, s.intervalDays]));
  },

  async setSchedule(probeId: number, intervalDays: number, userId: number, transaction: Transaction): Promise<number | null> {
    const before = await ProbeScheduleRow.findByPk(probeId, { transaction });
    await ProbeScheduleRow.upsert({ probeId, intervalDays, updatedBy: userId, updatedAt: new Date() }, { transaction });
    return before?.intervalDays ?? null;
  },

  async insertReplacement(row: Omit<InferCreationAttributes<ProbeReplacementRowModel>, 'id'>, transaction: Transaction): Promise<number> {
    return (await ProbeReplacementRowModel.create(row, { transaction })).id;
  },

  async replacements(filter: { probeId?: number; limit: number }): Promise<ProbeReplacementRow[]> {
    const rows = await q<Record<string, unknown>>(
      `SELECT r.*, p.tag AS probe_tag, u.name AS creator FROM probe_replacements r JOIN probes p ON p.id = r.probe_id JOIN users u ON u.id = r.created_by
        ${filter.probeId ? 'WHERE r.probe_id = :probeId' : ''} ORDER BY r.replaced_at DESC, r.id DESC LIMIT :limit`,
      { probeId: filter.probeId ?? null, limit: filter.limit },
    );
    return rows.map((r) => ({
      id: r.id as number, probeId: r.probe_id as number, probeTag: r.probe_tag as string, part: r.part as ProbeReplacementRow['part'],
      replacedAt: (r.replaced_at as Date).toISOString(), reason: r.reason as string, note: r.note as string | null,
      createdBy: { id: r.created_by as number, name: r.creator as string },
    }));
  },
};
