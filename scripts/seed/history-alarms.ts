/**
 * The alarm record of the demo week, written by the alarm lifecycle itself (applyAction).
 * Reading kinds are replayed over the stored readings with the engine's own condition logic
 * (limits, deadband, on- and off-delays); people's responses (acknowledge, out of service)
 * and the events of other features come as planned actions from the story.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { idleMemory, stepCondition, type ConditionMemory } from '../../shared/alarms/condition.ts';
import { KIND_INFO, limitFor, type AlarmKind } from '../../shared/alarms/kinds.ts';
import type { AlarmAction } from '../../shared/alarms/states.ts';
import { applyAction, type Actor } from '../../api/src/modules/alarms/lifecycle.ts';
import type { ConvertedReading } from '../../api/src/modules/readings/convert.ts';

export type AlarmDefinitionRow = {
  id: number; tankId: number; kind: AlarmKind; priority: number; threshold: number | null; deadband: number;
  onDelayS: number; offDelayS: number;
};

export type PlannedAction = {
  atMs: number; definitionId: number; action: AlarmAction; actor: Actor;
  value?: number; limit?: number; comment?: string; reason?: string;
};

export const AUTOMATIC: Actor = { userId: null, name: null, how: 'automatic' };

/** Kinds judged on each reading without a sample window (1-minute history is too sparse for the 2-minute windows). */
const REPLAYED: readonly AlarmKind[] = ['ratio-below-band', 'ratio-above-band', 'orp-low', 'orp-high', 'temp-low', 'temp-high'];

export async function alarmDefinitions(sequelize: Sequelize): Promise<AlarmDefinitionRow[]> {
  return sequelize.query<AlarmDefinitionRow>(
    `SELECT id, tank_id AS tankId, kind, priority, threshold, deadband, on_delay_s AS onDelayS, off_delay_s AS offDelayS
       FROM alarm_definitions WHERE tank_id IS NOT NULL ORDER BY id`, { type: QueryTypes.SELECT });
}

const valueOf = (kind: AlarmKind, r: ConvertedReading) =>
  kind.startsWith('ratio') ? r.ratio : kind.startsWith('orp') ? r.orpMv : r.tempC;

/**
 * Activations and clears the engine would have made over these readings.
 * @param bandAt the band in force for a tank at a time (bands changed during the week)
 */
export function replayReadingAlarms(
  defs: AlarmDefinitionRow[], readingsByTank: Map<number, ConvertedReading[]>,
  bandAt: (tankId: number, tMs: number) => { low: number; high: number },
): PlannedAction[] {
  const out: PlannedAction[] = [];
  for (const def of defs.filter((d) => REPLAYED.includes(d.kind))) {
    const info = KIND_INFO[def.kind];
    let memory: ConditionMemory = idleMemory(false);
    for (const r of readingsByTank.get(def.tankId) ?? []) {
      const limit = limitFor(def.kind, def.threshold, bandAt(def.tankId, r.tsMs));
      if (limit === null) break;
      const value = valueOf(def.kind, r);
      const step = stepCondition(memory, {
        direction: info.direction, limit, deadband: def.deadband, relativeDeadband: info.deadbandUnit === '%',
        onDelayS: def.onDelayS, offDelayS: def.offDelayS,
      }, value, r.tsMs);
      memory = step.change ? idleMemory(step.change === 'activate') : step.memory;
      if (step.change) out.push({ atMs: r.tsMs, definitionId: def.id, action: step.change, actor: AUTOMATIC, value, limit });
    }
  }
  return out;
}

/**
 * Applies the actions in time order through the lifecycle. A refused acknowledge is a person
 * pressing the button twice and is skipped; any other refusal means the story is wrong.
 */
export async function applyPlanned(sequelize: Sequelize, actions: PlannedAction[]): Promise<number> {
  const sorted = [...actions].sort((a, b) => a.atMs - b.atMs);
  for (const a of sorted) {
    const res = await applyAction(sequelize, {
      definitionId: a.definitionId, action: a.action, at: new Date(a.atMs), actor: a.actor,
      value: a.value ?? null, limit: a.limit ?? null, comment: a.comment ?? null, reason: a.reason ?? null,
    });
    if (!res.ok && a.action !== 'acknowledge') throw new Error(`demo alarm history: ${a.action} on definition ${a.definitionId} refused: ${res.reason}`);
  }
  return sorted.length;
}
