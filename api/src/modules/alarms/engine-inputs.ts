import type { Sequelize } from 'sequelize';
import { logger } from '../../lib/logger.ts';
import { recordCalibrationDrift } from './alarm-inputs.repository.ts';

/**
 * Optional pull hooks into the features that own the inputs of two alarm kinds; the notifier
 * wires them. Without them the engine still works from alarm_inputs (pushed by the hooks in
 * inputs.ts) and a weekly default check interval.
 */
export type AlarmInputProviders = {
  /** Probe minus lab, mV, for the newest usable assay of a tank (assays feature), or null. */
  calibrationDriftMv?: (tankId: number) => Promise<number | null>;
  /** When each tank's probe check falls due (probe checks feature). */
  probeCheckDue?: (now: Date) => Promise<Array<{ tankId: number; dueAt: string }>>;
  /** How often to ask the providers; their answers change with lab work, not by the second. */
  refreshMs?: number;
};

/** Weekly check against a standard solution is common practice. */
export const DEFAULT_CHECK_INTERVAL_DAYS = 7;

export function inputPuller(sequelize: Sequelize, providers: AlarmInputProviders | undefined) {
  let lastPullMs = -Infinity;
  let dueByTank = new Map<number, number>();
  return {
    /** Due time per tank from the provider (empty without one). */
    dueAt: (tankId: number): number | undefined => dueByTank.get(tankId),
    /** Refreshes from the providers at most every refreshMs; a failing provider is logged and skipped. */
    async refresh(now: Date, tankIds: number[]): Promise<void> {
      if (!providers || now.getTime() - lastPullMs < (providers.refreshMs ?? 60_000)) return;
      lastPullMs = now.getTime();
      try {
        if (providers.probeCheckDue) dueByTank = new Map((await providers.probeCheckDue(now)).map((d) => [d.tankId, Date.parse(d.dueAt)]));
        if (providers.calibrationDriftMv) {
          for (const tankId of tankIds) {
            const drift = await providers.calibrationDriftMv(tankId);
            if (drift !== null) await recordCalibrationDrift(sequelize, tankId, drift, now);
          }
        }
      } catch (err) {
        logger.warn({ err: (err as Error).message }, 'alarm input provider failed');
      }
    },
  };
}
