/**
 * What happened at Kestrel Flats in the week before the demo starts. Every time is relative to
 * the moment of seeding, so a fresh start always opens on the same week: a feed upset on A3 two
 * days ago, a B2 probe that drifted low until it was cleaned yesterday, one probe (A6) whose
 * weekly check was missed. All invented.
 */
export const MINUTE_MS = 60_000;
export const HOUR_MS = 3_600_000;
export const DAY_MS = 86_400_000;

export const HISTORY_DAYS = 7;
/** The ingest default; history older than the site's raw retention would be refused anyway. */
export const HISTORY_RETENTION_DAYS = 90;

export type DemoStory = {
  /** First and one-past-last reading time of the history, whole minutes (UTC ms). */
  startMs: number;
  endMs: number;
  /** Feed surge of reduced slurry into A3 (the tank model's feedUpset input). */
  upset: { tankTag: string; fromMs: number; toMs: number };
  /** B2's platinum fouls and reads ever lower until it is pulled, cleaned and refitted. */
  drift: { probeTag: string; tankTag: string; fromMs: number; mvPerDay: number; pulledMs: number; refittedMs: number };
  /** The probe whose weekly check nobody recorded. */
  overdueProbeTag: string;
  /** The upper limit of Train A was raised six days ago; B4's band was capped four days ago. */
  bandChanges: { trainAMs: number; b4Ms: number; a3RequestMs: number };
};

const floorMinute = (ms: number) => Math.floor(ms / MINUTE_MS) * MINUTE_MS;

export function demoStory(nowMs: number): DemoStory {
  const endMs = floorMinute(nowMs);
  const upsetFrom = floorMinute(nowMs - 2 * DAY_MS);
  const pulled = floorMinute(nowMs - 20 * HOUR_MS);
  return {
    startMs: endMs - HISTORY_DAYS * DAY_MS,
    endMs,
    upset: { tankTag: 'A3', fromMs: upsetFrom, toMs: upsetFrom + 42 * MINUTE_MS },
    drift: { probeTag: 'B2-ORP', tankTag: 'B2', fromMs: floorMinute(nowMs - 4.5 * DAY_MS), mvPerDay: 3.6, pulledMs: pulled, refittedMs: pulled + 12 * MINUTE_MS },
    overdueProbeTag: 'A6-ORP',
    bandChanges: {
      trainAMs: floorMinute(nowMs - 6 * DAY_MS + 2 * HOUR_MS),
      b4Ms: floorMinute(nowMs - 4 * DAY_MS - 3 * HOUR_MS),
      a3RequestMs: upsetFrom + 3 * HOUR_MS,
    },
  };
}

/** mV the fouled B2 probe reads below the truth at a time (0 outside the drift). */
export function driftMv(story: DemoStory, probeTag: string, tMs: number): number {
  const d = story.drift;
  if (probeTag !== d.probeTag || tMs < d.fromMs || tMs >= d.pulledMs) return 0;
  return -((tMs - d.fromMs) / DAY_MS) * d.mvPerDay;
}

export const inCleaningGap = (story: DemoStory, probeTag: string, tMs: number) =>
  probeTag === story.drift.probeTag && tMs >= story.drift.pulledMs && tMs < story.drift.refittedMs;
