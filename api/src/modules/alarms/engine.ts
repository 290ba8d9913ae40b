import type { Sequelize } from 'sequelize';
import { idleMemory, stepCondition, type ConditionMemory, type ConditionSettings } from '../../../../shared/alarms/condition.ts';
import { KIND_INFO, READING_KINDS, TICK_KINDS, limitFor } from '../../../../shared/alarms/kinds.ts';
import { windowedValue, type WindowedKind } from '../../../../shared/alarms/measures.ts';
import type { AlarmAction } from '../../../../shared/alarms/states.ts';
import type { TankLive } from '../../../../shared/schemas/readings.ts';
import { logger } from '../../lib/logger.ts';
import {
  definitionsForTanks, expiredOutOfService, expiredShelves, lastReadingTimes, recentSamples, suppressionChanges, timerDefinitions,
  type EvalDefinition, type TimerDefinition,
} from './engine.repository.ts';
import { DEFAULT_CHECK_INTERVAL_DAYS, inputPuller, type AlarmInputProviders } from './engine-inputs.ts';
import { SampleWindows } from './engine-windows.ts';
import { recordCalibrationDrift } from './alarm-inputs.repository.ts';
import { applyAction, type Actor } from './lifecycle.ts';

export type AlarmEngine = {
  /** Evaluates the reading-driven definitions of these tanks; call after each ingest commit. */
  onReadings(readings: TankLive[]): Promise<void>;
  /** Shelve expiry, offline suppression, stale, probe-check-overdue and calibration drift; run every 5–10 s. */
  tick(): Promise<void>;
  /** Hook for the assays feature: records the probe-vs-assay difference and evaluates it at once. */
  raiseCalibrationDrift(tankId: number, diffMv: number): Promise<void>;
};

const AUTOMATIC: Actor = { userId: null, name: null, how: 'automatic' };

/**
 * The alarm engine. Conditions are judged on sample time (reading ts) for reading kinds, so a
 * backlog delivered late still honours on- and off-delays, and on the injected clock for the
 * timer kinds. Whether a condition is active is always taken from the open instance in the
 * database; only the delay timers and sample windows live in memory (a restart restarts them).
 */
export function createAlarmEngine(opts: { sequelize: Sequelize; now?: () => Date; inputs?: AlarmInputProviders }): AlarmEngine {
  const { sequelize } = opts;
  const inputs = inputPuller(sequelize, opts.inputs);
  const now = opts.now ?? (() => new Date());
  const memory = new Map<number, ConditionMemory>();
  const lastEvaluatedMs = new Map<number, number>();
  const lastSeenMs = new Map<number, number>();
  const windows = new SampleWindows((probeId, sinceMs) => recentSamples(sequelize, probeId, sinceMs));
  // Probes get a full stale window after the engine starts: a plant starting up is not a plant gone quiet.
  const startedMs = now().getTime();

  const settingsOf = (def: EvalDefinition): ConditionSettings | null => {
    const limit = limitFor(def.kind, def.threshold, { low: def.bandLow, high: def.bandHigh });
    if (limit === null) return null;
    const info = KIND_INFO[def.kind];
    return { direction: info.direction, limit, deadband: def.deadband, relativeDeadband: info.deadbandUnit === '%', onDelayS: def.onDelayS, offDelayS: def.offDelayS };
  };

  async function act(def: EvalDefinition, action: AlarmAction, extra: { value?: number; limit?: number; comment?: string } = {}) {
    const result = await applyAction(sequelize, { definitionId: def.id, action, at: now(), actor: AUTOMATIC, ...extra });
    // Refused means another process got there first: take the database's word for the state.
    if (result.ok) Object.assign(def, { instanceId: result.instanceId, state: result.to.state, conditionActive: result.to.conditionActive });
    else Object.assign(def, { state: result.status.state, conditionActive: result.status.conditionActive });
    return result.ok;
  }

  async function evaluate(def: EvalDefinition, value: number | null, atMs: number): Promise<void> {
    const settings = settingsOf(def);
    if (!settings) return;
    const held = memory.get(def.id);
    const mem = held && held.active === def.conditionActive ? held : idleMemory(def.conditionActive);
    const step = stepCondition(mem, settings, value, atMs);
    if (step.change) {
      // Memory moves on only once the transition is stored, so a failed write is retried next time.
      await act(def, step.change, { value: value ?? undefined, limit: settings.limit });
      memory.set(def.id, idleMemory(def.conditionActive));
    } else {
      memory.set(def.id, step.memory);
    }
  }

  /** Offline tanks are suppressed by design and not evaluated; returns true when skipped. */
  async function skipOffline(def: EvalDefinition): Promise<boolean> {
    if (!def.offline) return false;
    memory.delete(def.id);
    if (def.instanceId && def.state !== 'suppressed' && def.state !== 'out-of-service') await act(def, 'suppress', { comment: 'Tank marked offline' });
    return true;
  }

  function readingValue(def: EvalDefinition, r: TankLive, tMs: number): number | null {
    switch (def.kind) {
      case 'ratio-below-band': case 'ratio-above-band': return r.ratio;
      case 'orp-low': case 'orp-high': return r.orpMv;
      case 'temp-low': case 'temp-high': return r.tempC;
      case 'orp-rate': case 'probe-flatline': case 'probe-noisy':
        return def.windowS ? windowedValue(def.kind as WindowedKind, windows.samples(r.probeId), tMs, def.windowS) : null;
      default: return null;
    }
  }

  function timerValue(def: TimerDefinition, atMs: number, lastDb: Map<number, number>): number | null {
    if (def.kind === 'calibration-drift') return def.driftMv === null ? null : Math.abs(def.driftMv);
    if (def.kind === 'probe-check-overdue') {
      // Hours past the due date: from the probe checks feature, else a weekly default.
      const since = def.lastProbeCheckAt ?? def.installedAt;
      const due = inputs.dueAt(def.tankId) ?? (since ? new Date(since).getTime() + DEFAULT_CHECK_INTERVAL_DAYS * 86_400_000 : null);
      return due === null ? null : (atMs - due) / 3_600_000;
    }
    if (def.kind === 'stale' && def.probeId !== null && def.intervalS) {
      const seen = Math.max(lastDb.get(def.probeId) ?? -Infinity, lastSeenMs.get(def.probeId) ?? -Infinity, startedMs);
      return (atMs - seen) / (def.intervalS * 1000);
    }
    return null;
  }

  async function evaluateTimerKinds(tankId?: number): Promise<void> {
    const at = now().getTime();
    let defs = (await timerDefinitions(sequelize, TICK_KINDS)).filter((d) => tankId === undefined || d.tankId === tankId);
    if (tankId === undefined && opts.inputs) {
      await inputs.refresh(new Date(at), [...new Set(defs.filter((d) => d.kind === 'calibration-drift').map((d) => d.tankId))]);
      defs = await timerDefinitions(sequelize, TICK_KINDS);
    }
    const probeIds = [...new Set(defs.filter((d) => d.kind === 'stale' && d.probeId !== null).map((d) => d.probeId!))];
    const lastDb = await lastReadingTimes(sequelize, probeIds);
    for (const def of defs) {
      if (await skipOffline(def)) continue;
      await evaluate(def, timerValue(def, at, lastDb), at);
    }
  }

  async function guarded(what: string, fn: () => Promise<void>): Promise<void> {
    try {
      await fn();
    } catch (err) {
      logger.error({ err: (err as Error).message, what }, 'alarm engine step failed; retried on the next call');
    }
  }

  return {
    async onReadings(readings) {
      if (readings.length === 0) return;
      // Sample time parsed once per reading (the ingest worker hands over thousands per flush).
      const sorted = readings.map((r) => ({ r, tMs: Date.parse(r.ts) })).sort((a, b) => a.tMs - b.tMs);
      const byTank = new Map<number, { r: TankLive; tMs: number }[]>();
      for (const item of sorted) {
        const list = byTank.get(item.r.tankId);
        if (list) list.push(item);
        else byTank.set(item.r.tankId, [item]);
        lastSeenMs.set(item.r.probeId, Math.max(lastSeenMs.get(item.r.probeId) ?? 0, item.tMs));
      }
      const defs = await definitionsForTanks(sequelize, [...byTank.keys()], READING_KINDS);
      // Sample windows only for probes with a windowed definition, each as long as its longest window needs.
      const keepMs = new Map<number, number>();
      for (const def of defs.filter((d) => d.windowS && KIND_INFO[d.kind].windowed)) {
        for (const probeId of new Set(byTank.get(def.tankId)!.map(({ r }) => r.probeId))) {
          const keep = def.windowS! * 1000 + 60_000;
          keepMs.set(probeId, Math.max(keepMs.get(probeId) ?? 0, keep));
          await windows.ensure(probeId, now().getTime(), keep);
        }
      }
      for (const { r, tMs } of sorted) {
        const keep = keepMs.get(r.probeId);
        if (keep !== undefined) windows.push(r.probeId, { tMs, orpMv: r.orpMv }, keep);
      }
      for (const def of defs) {
        await guarded(`definition ${def.id}`, async () => {
          if (await skipOffline(def)) return;
          for (const { r, tMs } of byTank.get(def.tankId)!) {
            if (tMs <= (lastEvaluatedMs.get(def.id) ?? -Infinity)) continue;
            lastEvaluatedMs.set(def.id, tMs);
            await evaluate(def, readingValue(def, r, tMs), tMs);
          }
        });
      }
    },

    async tick() {
      const at = now();
      await guarded('shelve expiry', async () => {
        for (const s of await expiredShelves(sequelize, at)) {
          await applyAction(sequelize, { instanceId: s.id, action: 'unshelve', at, actor: AUTOMATIC, comment: 'Shelve expired' });
        }
      });
      await guarded('out-of-service expiry', async () => {
        for (const s of await expiredOutOfService(sequelize, at)) {
          await applyAction(sequelize, { definitionId: s.definition_id, action: 'return-to-service', at, actor: AUTOMATIC, comment: 'Out-of-service period ended' });
        }
      });
      await guarded('suppression', async () => {
        for (const s of await suppressionChanges(sequelize)) {
          const action = s.offline ? 'suppress' : 'unsuppress';
          await applyAction(sequelize, { instanceId: s.id, action, at, actor: AUTOMATIC, comment: s.offline ? 'Tank marked offline' : 'Tank back online' });
        }
      });
      await guarded('timer kinds', () => evaluateTimerKinds());
    },

    async raiseCalibrationDrift(tankId, diffMv) {
      await recordCalibrationDrift(sequelize, tankId, diffMv, now());
      await evaluateTimerKinds(tankId);
    },
  };
}
