/**
 * Alarm-rate figures after ISA-18.2 / EEMUA 191, as pure functions over plain records (targets and their
 * sources in targets.ts). An "alarm" here is an annunciation: a transition into unacknowledged
 * that the operator saw; condition changes while shelved, suppressed or out of service are not
 * counted, but they do count towards chattering (a chattering alarm is often shelved).
 */
import type { Priority } from './kinds.ts';
import { ALARM_TARGETS } from './targets.ts';

export type Annunciation = { atMs: number; definitionId: number; priority: Priority; label: string; ackedAtMs: number | null };
export type Activation = { atMs: number; definitionId: number; label: string };
export type OpenAlarm = { definitionId: number; label: string; priority: Priority; activatedAtMs: number };

const TEN_MIN = 600_000;
const HOUR = 3_600_000;

/** Counts per consecutive bucket from fromMs; the last bucket may be partial. */
export function bucketCounts(times: readonly number[], fromMs: number, toMs: number, sizeMs: number): number[] {
  const n = Math.max(1, Math.ceil((toMs - fromMs) / sizeMs));
  const out = new Array<number>(n).fill(0);
  for (const t of times) if (t >= fromMs && t < toMs) out[Math.floor((t - fromMs) / sizeMs)] += 1;
  return out;
}

export type RateFigure = { mean: number; max: number; buckets: number[] };

export function rateFigure(times: readonly number[], fromMs: number, toMs: number, sizeMs: number): RateFigure {
  const buckets = bucketCounts(times, fromMs, toMs, sizeMs);
  const inside = times.filter((t) => t >= fromMs && t < toMs).length;
  return { mean: inside / Math.max((toMs - fromMs) / sizeMs, 1e-9), max: Math.max(0, ...buckets), buckets };
}

export type Flood = { startMs: number; endMs: number | null; count: number; peakPer10Min: number };

/**
 * Flood periods: one starts when more than 10 alarms fall in the last 10 minutes and ends when
 * fewer than 5 do (ALARM_TARGETS, from memory). Checked at every alarm and every minute.
 */
export function floods(timesIn: readonly number[], fromMs: number, toMs: number): Flood[] {
  const times = timesIn.filter((t) => t >= fromMs && t < toMs).sort((a, b) => a - b);
  const checks = [...new Set([...times, ...Array.from({ length: Math.ceil((toMs - fromMs) / 60_000) + 1 }, (_, i) => fromMs + i * 60_000)])]
    .filter((t) => t <= toMs).sort((a, b) => a - b);
  const out: Flood[] = [];
  let current: Flood | null = null;
  let lo = 0, hi = 0;
  for (const t of checks) {
    while (hi < times.length && times[hi] <= t) hi += 1;
    while (lo < hi && times[lo] <= t - TEN_MIN) lo += 1;
    const count = hi - lo;
    if (!current && count > ALARM_TARGETS.floodStartPer10Min.value) {
      current = { startMs: times[lo], endMs: null, count: 0, peakPer10Min: count };
    } else if (current) {
      current.peakPer10Min = Math.max(current.peakPer10Min, count);
      if (count < ALARM_TARGETS.floodEndPer10Min.value) {
        current.endMs = t;
        out.push(current);
        current = null;
      }
    }
  }
  if (current) out.push(current);
  for (const f of out) f.count = times.filter((t) => t >= f.startMs && (f.endMs === null || t <= f.endMs)).length;
  return out;
}

export type Chatter = { definitionId: number; label: string; worstIn60s: number; activations: number };

/** Definitions with 3 or more activations inside any 60 s (ALARM_TARGETS, from memory). */
export function chattering(acts: readonly Activation[]): Chatter[] {
  const byDef = new Map<number, Activation[]>();
  for (const a of acts) byDef.set(a.definitionId, [...(byDef.get(a.definitionId) ?? []), a]);
  const out: Chatter[] = [];
  const windowMs = ALARM_TARGETS.chatterWindowS.value * 1000;
  for (const [definitionId, list] of byDef) {
    const t = list.map((a) => a.atMs).sort((a, b) => a - b);
    let worst = 0;
    for (let i = 0, j = 0; i < t.length; i += 1) {
      while (t[i] - t[j] >= windowMs) j += 1;
      worst = Math.max(worst, i - j + 1);
    }
    if (worst >= ALARM_TARGETS.chatterCount.value) out.push({ definitionId, label: list[0].label, worstIn60s: worst, activations: t.length });
  }
  return out.sort((a, b) => b.worstIn60s - a.worstIn60s || b.activations - a.activations);
}

export type StaleAlarm = OpenAlarm & { hours: number };

/** Alarms active for more than 24 h (ALARM_TARGETS, from memory). */
export function staleAlarms(open: readonly OpenAlarm[], nowMs: number): StaleAlarm[] {
  const limit = ALARM_TARGETS.staleHours.value * HOUR;
  return open
    .filter((a) => nowMs - a.activatedAtMs > limit)
    .map((a) => ({ ...a, hours: (nowMs - a.activatedAtMs) / HOUR }))
    .sort((a, b) => b.hours - a.hours);
}

export type TopEntry = { definitionId: number; label: string; count: number; share: number };

/** The most frequent alarms, with their share of all alarms in the window. */
export function topFrequent(ann: readonly Annunciation[], n = 10): TopEntry[] {
  const counts = new Map<number, TopEntry>();
  for (const a of ann) {
    const e = counts.get(a.definitionId) ?? { definitionId: a.definitionId, label: a.label, count: 0, share: 0 };
    e.count += 1;
    counts.set(a.definitionId, e);
  }
  return [...counts.values()]
    .map((e) => ({ ...e, share: e.count / ann.length }))
    .sort((a, b) => b.count - a.count || a.definitionId - b.definitionId)
    .slice(0, n);
}

export type MixEntry = { count: number; share: number; target: number };

/** Counts and shares per priority beside the about 5/15/80 % target (from memory). */
export function priorityMix(ann: readonly Annunciation[]): Record<Priority, MixEntry> {
  const count = (p: Priority) => ann.filter((a) => a.priority === p).length;
  const share = (p: Priority) => (ann.length === 0 ? 0 : count(p) / ann.length);
  return {
    1: { count: count(1), share: share(1), target: ALARM_TARGETS.mixHigh.value },
    2: { count: count(2), share: share(2), target: ALARM_TARGETS.mixMedium.value },
    3: { count: count(3), share: share(3), target: ALARM_TARGETS.mixLow.value },
  };
}

export type AckTimes = { count: number; unacknowledged: number; meanS: number | null; maxS: number | null };

/** Mean and max time from annunciation to acknowledgement, in seconds. */
export function timeToAck(ann: readonly Annunciation[]): AckTimes {
  const s = ann.filter((a) => a.ackedAtMs !== null).map((a) => (a.ackedAtMs! - a.atMs) / 1000);
  return {
    count: s.length,
    unacknowledged: ann.length - s.length,
    meanS: s.length ? s.reduce((x, y) => x + y, 0) / s.length : null,
    maxS: s.length ? Math.max(...s) : null,
  };
}

export type AlarmFigures = {
  fromMs: number; toMs: number; total: number;
  per10Min: RateFigure; perHour: RateFigure;
  floods: Flood[]; chattering: Chatter[]; stale: StaleAlarm[]; top10: TopEntry[];
  priorityMix: Record<Priority, MixEntry>;
  timeToAck: AckTimes & { byPriority: Record<Priority, AckTimes> };
};

/** Every figure for one window. */
export function alarmFigures(input: { fromMs: number; toMs: number; nowMs: number; annunciations: Annunciation[]; activations: Activation[]; open: OpenAlarm[] }): AlarmFigures {
  const { fromMs, toMs } = input;
  const ann = input.annunciations.filter((a) => a.atMs >= fromMs && a.atMs < toMs);
  const times = ann.map((a) => a.atMs);
  const byP = (p: Priority) => timeToAck(ann.filter((a) => a.priority === p));
  return {
    fromMs, toMs, total: ann.length,
    per10Min: rateFigure(times, fromMs, toMs, TEN_MIN),
    perHour: rateFigure(times, fromMs, toMs, HOUR),
    floods: floods(times, fromMs, toMs),
    chattering: chattering(input.activations.filter((a) => a.atMs >= fromMs && a.atMs < toMs)),
    stale: staleAlarms(input.open, input.nowMs),
    top10: topFrequent(ann, 10),
    priorityMix: priorityMix(ann),
    timeToAck: { ...timeToAck(ann), byPriority: { 1: byP(1), 2: byP(2), 3: byP(3) } },
  };
}
