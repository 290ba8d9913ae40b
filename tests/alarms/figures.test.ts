import { describe, expect, it } from 'vitest';
import { alarmFigures, chattering, floods, priorityMix, rateFigure, staleAlarms, timeToAck, topFrequent, type Annunciation } from '../../shared/alarms/figures.ts';
import { ALARM_TARGETS, sourceNote } from '../../shared/alarms/targets.ts';

/**
 * The flood, chattering, stale and mix thresholds are from memory (ISA-18.2, unverified), so these
 * tests never hard-code them: they read ALARM_TARGETS and check the logic around the threshold.
 */
const MIN = 60_000;
const T0 = Date.parse('2026-12-01T00:00:00Z');
const ann = (minute: number, definitionId = 1, priority: 1 | 2 | 3 = 3, ackAfterS: number | null = null): Annunciation => ({
  atMs: T0 + minute * MIN, definitionId, priority, label: `D${definitionId}`, ackedAtMs: ackAfterS === null ? null : T0 + minute * MIN + ackAfterS * 1000,
});

describe('alarm-rate figures', () => {
  it('when 6 alarms fall in one hour, then the hourly mean is 6 and the 10-minute buckets show where they fell', () => {
    const times = [0, 1, 2, 30, 31, 59].map((m) => T0 + m * MIN);
    const hour = rateFigure(times, T0, T0 + 60 * MIN, 60 * MIN);
    expect(hour).toEqual({ mean: 6, max: 6, buckets: [6] });
    const ten = rateFigure(times, T0, T0 + 60 * MIN, 10 * MIN);
    expect(ten.buckets).toEqual([3, 0, 0, 2, 0, 1]);
    expect(ten.mean).toBe(1);
  });

  it('when one more alarm than the flood threshold falls within 10 minutes, then one flood is reported, ending when the rate drops below the end threshold', () => {
    const n = ALARM_TARGETS.floodStartPer10Min.value + 1;
    const times = Array.from({ length: n }, (_, i) => T0 + i * 20_000);
    const f = floods(times, T0, T0 + 60 * MIN);
    expect(f).toHaveLength(1);
    expect(f[0].startMs).toBe(T0);
    expect(f[0].count).toBe(n);
    expect(f[0].peakPer10Min).toBe(n);
    // It ends once fewer than the end threshold remain in the trailing 10 minutes.
    expect(f[0].endMs).not.toBeNull();
    expect(times.filter((t) => t > f[0].endMs! - 10 * MIN && t <= f[0].endMs!).length).toBeLessThan(ALARM_TARGETS.floodEndPer10Min.value);
  });

  it('when exactly the flood threshold falls within 10 minutes, then there is no flood', () => {
    const times = Array.from({ length: ALARM_TARGETS.floodStartPer10Min.value }, (_, i) => T0 + i * 20_000);
    expect(floods(times, T0, T0 + 60 * MIN)).toEqual([]);
  });

  it('when an alarm activates the chattering count of times within 60 s, then it is chattering; one fewer is not', () => {
    const k = ALARM_TARGETS.chatterCount.value;
    const acts = (n: number, id: number) => Array.from({ length: n }, (_, i) => ({ atMs: T0 + i * 10_000, definitionId: id, label: `D${id}` }));
    const result = chattering([...acts(k, 1), ...acts(k - 1, 2)]);
    expect(result.map((c) => c.definitionId)).toEqual([1]);
    expect(result[0].worstIn60s).toBe(k);
  });

  it('when an alarm has been active longer than the stale limit, then it is listed as stale', () => {
    const limitH = ALARM_TARGETS.staleHours.value;
    const now = T0 + (limitH + 1) * 3_600_000;
    const stale = staleAlarms([{ definitionId: 1, label: 'old', priority: 2, activatedAtMs: T0 }, { definitionId: 2, label: 'new', priority: 2, activatedAtMs: now - 3_600_000 }], now);
    expect(stale.map((s) => s.label)).toEqual(['old']);
    expect(stale[0].hours).toBeCloseTo(limitH + 1, 6);
  });

  it('when alarms repeat, then the top list is ordered by count with shares', () => {
    const top = topFrequent([ann(0, 1), ann(1, 2), ann(2, 2), ann(3, 3), ann(4, 2), ann(5, 1)]);
    expect(top.map((t) => [t.definitionId, t.count])).toEqual([[2, 3], [1, 2], [3, 1]]);
    expect(top[0].share).toBeCloseTo(0.5, 10);
  });

  it('when priorities are mixed, then counts and shares sit beside the targets', () => {
    const mix = priorityMix([ann(0, 1, 1), ann(1, 1, 2), ann(2, 1, 3), ann(3, 1, 3)]);
    expect(mix[3]).toEqual({ count: 2, share: 0.5, target: ALARM_TARGETS.mixLow.value });
    expect(mix[1].count).toBe(1);
  });

  it('when some alarms are acknowledged, then mean and max time to acknowledge use only those', () => {
    expect(timeToAck([ann(0, 1, 1, 30), ann(1, 1, 1, 90), ann(2, 1, 1, null)])).toEqual({ count: 2, unacknowledged: 1, meanS: 60, maxS: 90 });
    expect(timeToAck([])).toEqual({ count: 0, unacknowledged: 0, meanS: null, maxS: null });
  });

  it('when all figures are computed for a window, then alarms outside it are left out', () => {
    const f = alarmFigures({ fromMs: T0, toMs: T0 + 60 * MIN, nowMs: T0 + 60 * MIN, annunciations: [ann(-5), ann(5, 1, 1, 60), ann(70)], activations: [], open: [] });
    expect(f.total).toBe(1);
    expect(f.timeToAck.byPriority[1].meanS).toBe(60);
  });

  it('when a target is unverified, then its label says common practice and cites nothing; a seen one names its publication', () => {
    expect(sourceNote(ALARM_TARGETS.perHourMax)).toBe('common practice');
    expect(sourceNote(ALARM_TARGETS.chatterCount)).toBe('common practice');
    expect(sourceNote(ALARM_TARGETS.per10MinAim)).toBe('EEMUA 191 via published benchmarking');
  });
});
