import type { Logger } from 'pino';
import type { TankLive } from '../../../../shared/schemas/readings.ts';
import type { AlarmEngine } from './engine.ts';

/**
 * Feeds committed readings to the engine from a synchronous hook (the ingest flusher's
 * onCommitted) without ever holding up ingestion: one evaluation at a time, in commit order;
 * readings arriving meanwhile are merged into the next call, so a slow database makes alarm
 * evaluation batch up instead of queueing without bound. Failures are logged, not thrown:
 * conditions are re-judged from the next readings.
 */
export function queueAlarmReadings(engine: AlarmEngine, log: Pick<Logger, 'warn'>) {
  let pending: TankLive[] = [];
  let running: Promise<void> | null = null;

  const run = async (): Promise<void> => {
    while (pending.length > 0) {
      const batch = pending;
      pending = [];
      try {
        await engine.onReadings(batch);
      } catch (err) {
        log.warn({ err: (err as Error).message, readings: batch.length }, 'alarm evaluation failed');
      }
    }
    running = null;
  };

  return {
    push(readings: TankLive[]): void {
      if (readings.length === 0) return;
      pending.push(...readings);
      running ??= run();
    },
    /** Waits until everything pushed so far has been evaluated (call before closing the database). */
    async drain(): Promise<void> {
      while (running) await running;
    },
  };
}
