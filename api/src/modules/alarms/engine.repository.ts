import { QueryTypes, type Sequelize } from 'sequelize';
import type { AlarmKind } from '../../../../shared/alarms/kinds.ts';
import type { AlarmState } from '../../../../shared/alarms/states.ts';

/** What the engine needs of one definition to evaluate it; band and offline read live from tanks. */
export type EvalDefinition = {
  id: number; tankId: number; kind: AlarmKind; threshold: number | null; deadband: number;
  onDelayS: number; offDelayS: number; windowS: number | null;
  bandLow: number; bandHigh: number; offline: boolean;
  instanceId: number | null; state: AlarmState | null; conditionActive: boolean;
};

export type TimerDefinition = EvalDefinition & {
  probeId: number | null; intervalS: number | null; installedAt: Date | null;
  driftMv: number | null; lastProbeCheckAt: Date | null;
};

type Row = {
  id: number; tank_id: number; kind: AlarmKind; threshold: number | null; deadband: number; on_delay_s: number; off_delay_s: number;
  window_s: number | null; band_low: number; band_high: number; offline: number; instance_id: number | null; state: AlarmState | null;
  condition_active: number | null; probe_id?: number | null; interval_s?: number | null; installed_at?: Date | null;
  calibration_drift_mv?: number | null; last_probe_check_at?: Date | null;
};

const BASE = `SELECT d.id, d.tank_id, d.kind, d.threshold, d.deadband, d.on_delay_s, d.off_delay_s, d.window_s,
  t.band_low, t.band_high, t.offline, i.id AS instance_id, i.state, i.condition_active`;

const toEval = (r: Row): EvalDefinition => ({
  id: r.id, tankId: r.tank_id, kind: r.kind, threshold: r.threshold, deadband: r.deadband, onDelayS: r.on_delay_s,
  offDelayS: r.off_delay_s, windowS: r.window_s, bandLow: r.band_low, bandHigh: r.band_high, offline: r.offline === 1,
  instanceId: r.instance_id, state: r.state, conditionActive: r.condition_active === 1,
});

/** Definitions of the given kinds for these tanks, with their open instance if any. */
export async function definitionsForTanks(sequelize: Sequelize, tankIds: number[], kinds: readonly AlarmKind[]): Promise<EvalDefinition[]> {
  if (tankIds.length === 0) return [];
  const rows = await sequelize.query<Row>(
    `${BASE} FROM alarm_definitions d JOIN tanks t ON t.id = d.tank_id
       LEFT JOIN alarm_instances i ON i.open_definition_id = d.id
      WHERE d.tank_id IN (:tankIds) AND d.kind IN (:kinds)`,
    { replacements: { tankIds, kinds }, type: QueryTypes.SELECT });
  return rows.map(toEval);
}

/** Every timer- and input-driven definition with its probe and fed values. */
export async function timerDefinitions(sequelize: Sequelize, kinds: readonly AlarmKind[]): Promise<TimerDefinition[]> {
  const rows = await sequelize.query<Row>(
    `${BASE}, p.id AS probe_id, p.interval_s, p.installed_at, ai.calibration_drift_mv, ai.last_probe_check_at
       FROM alarm_definitions d JOIN tanks t ON t.id = d.tank_id
       LEFT JOIN probes p ON p.tank_id = t.id AND p.active = 1
       LEFT JOIN alarm_inputs ai ON ai.tank_id = t.id
       LEFT JOIN alarm_instances i ON i.open_definition_id = d.id
      WHERE d.kind IN (:kinds)`,
    { replacements: { kinds }, type: QueryTypes.SELECT });
  return rows.map((r) => ({
    ...toEval(r), probeId: r.probe_id ?? null, intervalS: r.interval_s ?? null, installedAt: r.installed_at ?? null,
    driftMv: r.calibration_drift_mv ?? null, lastProbeCheckAt: r.last_probe_check_at ?? null,
  }));
}

/** Newest reading time per probe; the (probe_id, ts) primary key makes this an index walk. */
export async function lastReadingTimes(sequelize: Sequelize, probeIds: number[]): Promise<Map<number, number>> {
  if (probeIds.length === 0) return new Map();
  const rows = await sequelize.query<{ probe_id: number; ts: Date }>(
    'SELECT probe_id, MAX(ts) AS ts FROM readings WHERE probe_id IN (:probeIds) GROUP BY probe_id',
    { replacements: { probeIds }, type: QueryTypes.SELECT });
  return new Map(rows.map((r) => [r.probe_id, new Date(r.ts).getTime()]));
}

/** Recent ORP samples of a probe, to fill the windows after a restart. */
export async function recentSamples(sequelize: Sequelize, probeId: number, sinceMs: number): Promise<Array<{ tMs: number; orpMv: number }>> {
  const rows = await sequelize.query<{ ts: Date; orp_mv: number }>(
    'SELECT ts, orp_mv FROM readings WHERE probe_id = ? AND ts > ? ORDER BY ts',
    { replacements: [probeId, new Date(sinceMs)], type: QueryTypes.SELECT });
  return rows.map((r) => ({ tMs: new Date(r.ts).getTime(), orpMv: r.orp_mv }));
}

/** Open instances whose shelve has run out. */
export async function expiredShelves(sequelize: Sequelize, now: Date): Promise<Array<{ id: number }>> {
  return sequelize.query<{ id: number }>(
    "SELECT id FROM alarm_instances WHERE state = 'shelved' AND shelved_until <= ? ORDER BY id",
    { replacements: [now], type: QueryTypes.SELECT });
}

/** Open instances whose out-of-service period has run out. */
export async function expiredOutOfService(sequelize: Sequelize, now: Date): Promise<Array<{ definition_id: number }>> {
  return sequelize.query<{ definition_id: number }>(
    "SELECT definition_id FROM alarm_instances WHERE state = 'out-of-service' AND oos_until <= ? ORDER BY id",
    { replacements: [now], type: QueryTypes.SELECT });
}

/** Open instances whose suppression no longer matches their tank's offline flag. */
export async function suppressionChanges(sequelize: Sequelize): Promise<Array<{ id: number; offline: number }>> {
  return sequelize.query<{ id: number; offline: number }>(
    `SELECT i.id, t.offline FROM alarm_instances i JOIN tanks t ON t.id = i.tank_id
      WHERE i.open_definition_id IS NOT NULL
        AND ((t.offline = 1 AND i.state NOT IN ('suppressed', 'out-of-service')) OR (t.offline = 0 AND i.state = 'suppressed'))
      ORDER BY i.id`,
    { type: QueryTypes.SELECT });
}
