/** An annunciation and, when it came, the first acknowledgement after it (UTC ms). */
export type Raised = { atMs: number; ackedAtMs: number | null };

/**
 * Mean and longest time to acknowledge, in seconds, over the alarms that were acknowledged.
 * Alarms still waiting are left out of both (their wait is not over) and counted apart.
 */
export function ackTimes(raised: Raised[]): { meanS: number | null; maxS: number | null; waiting: number } {
  const waits = raised.filter((r) => r.ackedAtMs !== null && r.ackedAtMs >= r.atMs).map((r) => (r.ackedAtMs! - r.atMs) / 1000);
  return {
    meanS: waits.length > 0 ? waits.reduce((a, b) => a + b, 0) / waits.length : null,
    maxS: waits.length > 0 ? Math.max(...waits) : null,
    waiting: raised.filter((r) => r.ackedAtMs === null).length,
  };
}
