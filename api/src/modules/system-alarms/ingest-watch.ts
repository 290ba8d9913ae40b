import type { PartState } from '../../../../shared/schemas/ingest-health.ts';
import type { WorkerBeat } from './system-alarms.repository.ts';

/**
 * Whether the ingest workers are storing readings, judged from their own heartbeats (they beat
 * while connected to the broker and the database, whether or not any device sends) and from the
 * supervisor's record of their exits, never from readings arriving: a quiet site is not a fault.
 *
 * Raise and clear are asymmetric so a crash-looping worker cannot make the alarm flap:
 * - trouble (raise): a worker's heartbeat is older than the threshold, or the supervisor saw
 *   it exit at least twice in a row within the threshold, or it has been waiting to restart
 *   longer than that, or none beats although the supervisor has run one longer than that
 *   (a worker stopped on purpose is not watched);
 * - healthy (clear): every worker beats, has run at least the threshold since it started, and
 *   none has exited within the threshold.
 * Anything in between keeps the alarm as it is.
 */
export type IngestWatchInput = {
  beats: WorkerBeat[];
  /** The supervisor's parts (npm start's run file); null when no supervisor runs this plant. */
  parts: PartState[] | null;
  nowMs: number;
  /** How long this process has been watching (a fresh notifier gives a starting worker time to beat). */
  watchingMs: number;
  thresholdMs: number;
};

/** oldestBeatS: age of the oldest heartbeat among the watched workers, s (the value the alarm records). */
export type IngestVerdict = { trouble: boolean; healthy: boolean; why: string; oldestBeatS: number | null };

/** Ingest worker parts of the supervisor: ingest, or ingest1, ingest2, … in a cluster. */
const isIngestPart = (p: PartState) => /^ingest\d*$/.test(p.name);

export function judgeIngest(i: IngestWatchInput): IngestVerdict {
  const T = i.thresholdMs;
  const parts = (i.parts ?? []).filter(isIngestPart);
  const exitAgo = (p: PartState) => (p.lastExit ? i.nowMs - Date.parse(p.lastExit.at) : Infinity);
  const beats = i.beats.filter((b) => !b.stopped);
  const stale = beats.filter((b) => b.beatAgeMs > T);
  const oldestS = beats.length ? Math.round(Math.max(...beats.map((b) => b.beatAgeMs)) / 1000) : null;

  const looping = parts.find((p) => (p.exitsInRow ?? 0) >= 2 && exitAgo(p) <= T);
  const waiting = parts.find((p) => p.state === 'restarting' && i.nowMs - Date.parse(p.since) > T);
  const silent = beats.length === 0 && i.watchingMs > T ? parts.find((p) => p.state === 'running' && i.nowMs - Date.parse(p.since) > T) : undefined;
  const why =
    stale.length ? `no heartbeat from ${stale.map((b) => b.worker).join(', ')} for ${oldestS} s`
    : looping ? `${looping.name} exited ${looping.exitsInRow} times in a row, last ${looping.lastExit!.how}`
    : waiting ? `${waiting.name} has been waiting to restart since ${waiting.since}`
    : silent ? `no heartbeat from any ingest worker since ${silent.name} started at ${silent.since}`
    : '';
  const settled = parts.every((p) => p.state === 'running' && exitAgo(p) > T);
  const healthy = !why && settled && beats.every((b) => b.upMs >= T) && (beats.length > 0 || parts.length === 0);
  return { trouble: why !== '', healthy, why, oldestBeatS: oldestS };
}
