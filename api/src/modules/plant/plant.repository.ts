import type { ReadingFlag } from '../../../../shared/redox/index.ts';
import { QueryTypes } from 'sequelize';
import type { CalibrationInfo, ProbeInfo, RecentReading, SiteSummary, TankSummary } from '../../../../shared/schemas/plant.ts';
import type { TankLive } from '../../../../shared/schemas/readings.ts';
import { Calibration, Circuit, Probe, Site, Tank } from '../../db/models.ts';
import { referenceLabel } from './reference-label.ts';

const iso = (d: Date) => d.toISOString();

type LatestRow = {
  probe_id: number; tank_id: number; tag: string; ts: Date; orp_mv: number; temp_c: number; eh_v: number;
  ratio: number; ferric_fraction: number; flag: ReadingFlag; calibration_version: number;
};

/** Newest reading per probe; the (probe_id, ts) primary key makes MAX(ts) per probe an index walk. */
async function latestByProbe(): Promise<Map<number, TankLive>> {
  const rows = await Site.sequelize!.query<LatestRow>(
    `SELECT r.probe_id, p.tank_id, p.tag, r.ts, r.orp_mv, r.temp_c, r.eh_v, r.ratio, r.ferric_fraction, r.flag, r.calibration_version
       FROM probes p
       JOIN readings r ON r.probe_id = p.id AND r.ts = (SELECT MAX(ts) FROM readings WHERE probe_id = p.id)
      WHERE p.active = 1`,
    { type: QueryTypes.SELECT },
  );
  return new Map(rows.map((r) => [r.probe_id, {
    tankId: r.tank_id, probeId: r.probe_id, probeTag: r.tag, ts: iso(r.ts), orpMv: r.orp_mv, tempC: r.temp_c,
    ehV: r.eh_v, ratio: r.ratio, ferricFraction: r.ferric_fraction, flag: r.flag, calibrationVersion: r.calibration_version,
  }]));
}

async function latestCalibrations(): Promise<Map<number, CalibrationInfo>> {
  const all = await Calibration.findAll({ order: [['tankId', 'ASC'], ['version', 'ASC']] });
  const byTank = new Map<number, CalibrationInfo>();
  for (const c of all) {
    byTank.set(c.tankId, { version: c.version, formalPotentialV: c.formalPotentialV, formalCoeffVPerK: c.formalCoeffVPerK, slopeEfficiency: c.slopeEfficiency, validFrom: iso(c.validFrom), reason: c.reason });
  }
  return byTank;
}

function toProbe(p: Probe): ProbeInfo {
  return {
    id: p.id, tag: p.tag, referenceId: p.referenceId, referenceLabel: referenceLabel(p.referenceId),
    referenceE25V: p.referenceE25V, referenceCoeffVPerK: p.referenceCoeffVPerK, toleranceMv: p.toleranceMv,
    intervalS: p.intervalS, installedAt: iso(p.installedAt),
  };
}

export const plantRepository = {
  /** The whole plant tree with band, active probe, calibration in force and latest reading per tank. */
  async tree(): Promise<SiteSummary[]> {
    const [sites, latest, calibrations] = await Promise.all([
      // Retired parts of the plant keep their readings but leave the Floor.
      Site.findAll({
        where: { retiredAt: null },
        include: [{
          model: Circuit, where: { retiredAt: null }, required: false,
          include: [{ model: Tank, where: { retiredAt: null }, required: false, include: [{ model: Probe, where: { active: true, retiredAt: null }, required: false }] }],
        }],
        order: [['tag', 'ASC'], [Circuit, 'position', 'ASC'], [Circuit, Tank, 'position', 'ASC']],
      }),
      latestByProbe(),
      latestCalibrations(),
    ]);
    return sites.map((s) => ({
      id: s.id, tag: s.tag, name: s.name, timeZone: s.timeZone,
      circuits: ((s as unknown as { Circuits: Circuit[] }).Circuits ?? []).map((c) => ({
        id: c.id, tag: c.tag, name: c.name, position: c.position, process: c.process,
        tanks: ((c as unknown as { Tanks: Tank[] }).Tanks ?? []).map((t): TankSummary => {
          const probe = (t as unknown as { Probes: Probe[] }).Probes?.[0];
          return {
            id: t.id, tag: t.tag, name: t.name, position: t.position, volumeM3: t.volumeM3, offline: t.offline,
            band: { low: t.bandLow, high: t.bandHigh, target: t.bandTarget },
            probe: probe ? toProbe(probe) : null,
            calibration: calibrations.get(t.id) ?? null,
            latest: probe ? latestByProbeGet(latest, probe.id) : null,
          };
        }),
      })),
    }));
  },

  async probeIntervals(): Promise<Array<{ probeId: number; tankId: number; siteTag: string; intervalS: number }>> {
    return Site.sequelize!.query(
      `SELECT p.id AS probeId, p.tank_id AS tankId, s.tag AS siteTag, p.interval_s AS intervalS
         FROM probes p JOIN tanks t ON t.id = p.tank_id JOIN circuits c ON c.id = t.circuit_id JOIN sites s ON s.id = c.site_id
        WHERE p.active = 1`,
      { type: QueryTypes.SELECT },
    );
  },

  /** The newest readings of a probe, newest first (a primary-key range walk). */
  async recentReadings(probeId: number, limit: number): Promise<RecentReading[]> {
    const rows = await Site.sequelize!.query<{ ts: Date; orp_mv: number; temp_c: number; ratio: number; flag: 'ok' | 'outside-range'; calibration_version: number }>(
      `SELECT ts, orp_mv, temp_c, ratio, flag, calibration_version FROM readings WHERE probe_id = :probeId ORDER BY ts DESC LIMIT ${Math.trunc(limit)}`,
      { replacements: { probeId }, type: QueryTypes.SELECT });
    return rows.map((r) => ({ ts: iso(r.ts), orpMv: r.orp_mv, tempC: r.temp_c, ratio: r.ratio, flag: r.flag, calibrationVersion: r.calibration_version }));
  },

  async probeOfTank(tankId: number): Promise<{ id: number; intervalS: number } | null> {
    const p = await Probe.findOne({ where: { tankId, active: true }, attributes: ['id', 'intervalS'] });
    return p && { id: p.id, intervalS: p.intervalS };
  },
};

function latestByProbeGet(map: Map<number, TankLive>, probeId: number): TankLive | null {
  return map.get(probeId) ?? null;
}
