import type { ProbeFreshness } from '@shared/schemas/socket-events';

/** A probe is stale after three expected intervals without a reading (same rule as the server). */
export const STALE_INTERVALS = 3;

/** What a screen shows about a probe's newest reading: its age and whether it is stale. */
export type FreshnessView = { ageS: number | null; stale: boolean };

/**
 * @param latestTs ISO time of the newest reading, or null
 * @param intervalS the probe's expected reporting interval, s
 * @param nowMs server-corrected now, ms
 * @param serverStale the last probe:freshness verdict for this probe, when one arrived
 */
export function freshnessOf(
  latestTs: string | null | undefined,
  intervalS: number,
  nowMs: number,
  serverStale?: Pick<ProbeFreshness, 'stale' | 'lastTs'>,
): FreshnessView {
  if (!latestTs) return { ageS: null, stale: true };
  const ageS = Math.max(0, (nowMs - Date.parse(latestTs)) / 1000);
  const byAge = ageS > STALE_INTERVALS * intervalS;
  // The server's verdict counts only while it is about the reading we show (or a newer one we missed).
  const byServer = !!serverStale?.stale && (!serverStale.lastTs || serverStale.lastTs >= latestTs);
  return { ageS, stale: byAge || byServer };
}
