import type { Sequelize } from 'sequelize';
import type { IngestAlarmView, PartState, WorkerBeatView } from '../../../../shared/schemas/ingest-health.ts';
import { applyAction, type Actor } from '../alarms/lifecycle.ts';
import { judgeIngest, type IngestVerdict } from './ingest-watch.ts';
import { systemAlarmsRepository as repo } from './system-alarms.repository.ts';

export type IngestWatchOptions = {
  sequelize: Sequelize;
  thresholdS: number;
  /** The supervisor's parts, or null when none runs this plant. */
  parts: () => Promise<PartState[] | null>;
};

export type IngestWatchResult = { verdict: IngestVerdict; changed: 'raised' | 'cleared' | null };

const AUTOMATIC: Actor = { userId: null, name: null, how: 'automatic' };

/**
 * Raises and clears the plant-wide "ingest stopped" alarm through the one alarm lifecycle, so it
 * is acknowledged, shelved, escalated and recorded like a tank's. Run by the process holding the
 * notifier lease (one per cluster); `reset` when the lease is lost, so a new holder gives the
 * workers the threshold before judging their silence.
 */
export function createIngestWatch(o: IngestWatchOptions) {
  let watchingSinceMs: number | null = null;
  return {
    reset(): void {
      watchingSinceMs = null;
    },
    async check(nowMs = Date.now()): Promise<IngestWatchResult> {
      watchingSinceMs ??= nowMs;
      const [beats, parts, alarm] = await Promise.all([repo.beats(o.sequelize), o.parts(), repo.plantAlarm(o.sequelize, 'ingest-stopped')]);
      const verdict = judgeIngest({ beats, parts, nowMs, watchingMs: nowMs - watchingSinceMs, thresholdMs: o.thresholdS * 1000 });
      if (!alarm) return { verdict, changed: null };
      const at = new Date(nowMs);
      if (verdict.trouble && !alarm.conditionActive) {
        const r = await applyAction(o.sequelize, {
          definitionId: alarm.definitionId, action: 'activate', at, actor: AUTOMATIC, value: verdict.oldestBeatS, limit: o.thresholdS, comment: verdict.why,
        });
        return { verdict, changed: r.ok ? 'raised' : null };
      }
      if (verdict.healthy && alarm.conditionActive) {
        const r = await applyAction(o.sequelize, {
          definitionId: alarm.definitionId, action: 'clear', at, actor: AUTOMATIC, value: verdict.oldestBeatS,
          comment: `Every ingest worker beats and has run at least ${o.thresholdS} s`,
        });
        return { verdict, changed: r.ok ? 'cleared' : null };
      }
      return { verdict, changed: null };
    },
  };
}

export type IngestWatch = ReturnType<typeof createIngestWatch>;

/** What Plant setup's health panel shows of the watch: each worker's heartbeat and the alarm. */
export async function ingestWatchView(sequelize: Sequelize): Promise<{ workers: WorkerBeatView[]; ingestAlarm: IngestAlarmView | null }> {
  const [workers, alarm] = await Promise.all([repo.beats(sequelize), repo.plantAlarm(sequelize, 'ingest-stopped')]);
  return { workers, ingestAlarm: alarm && { instanceId: alarm.instanceId, state: alarm.state, conditionActive: alarm.conditionActive } };
}
