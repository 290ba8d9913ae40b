import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { clearEdge, idleMemory, stepCondition, type ConditionMemory, type ConditionSettings } from '../../shared/alarms/condition.ts';
import { detrendedSpreadMv, slopeMvPerMin, spreadMv, windowedValue, windowOf, type Sample } from '../../shared/alarms/measures.ts';

const low: ConditionSettings = { direction: 'low', limit: 8, deadband: 10, relativeDeadband: true, onDelayS: 30, offDelayS: 20 };

/** Feeds (seconds, value) pairs and returns the changes with their times. */
function run(s: ConditionSettings, points: Array<[number, number | null]>, start: ConditionMemory = idleMemory()): Array<[number, string]> {
  let m = start;
  const out: Array<[number, string]> = [];
  for (const [tS, v] of points) {
    const r = stepCondition(m, s, v, tS * 1000);
    m = r.memory;
    if (r.change) out.push([tS, r.change]);
  }
  return out;
}

describe('condition evaluation', () => {
  it('when the value stays below the limit for the on-delay, then the alarm activates at the end of the delay', () => {
    expect(run(low, [[0, 7], [10, 7], [29, 7], [30, 7], [40, 7]])).toEqual([[30, 'activate']]);
  });

  it('when the value returns inside the limit before the on-delay ends, then nothing activates and the delay starts again', () => {
    expect(run(low, [[0, 7], [20, 8.5], [25, 7], [50, 7], [55, 7]])).toEqual([[55, 'activate']]);
  });

  it('when an active alarm returns inside the deadband only, then it stays active (no chattering)', () => {
    // Deadband 10 % of 8: the alarm clears only above 8.8.
    expect(clearEdge(low)).toBeCloseTo(8.8, 10);
    const changes = run({ ...low, onDelayS: 0, offDelayS: 0 }, [[0, 7.9], [1, 8.1], [2, 7.95], [3, 8.7], [4, 7.99], [5, 8.79]]);
    expect(changes).toEqual([[0, 'activate']]);
  });

  it('when an active alarm is past the deadband for the off-delay, then it clears at the end of the off-delay', () => {
    const changes = run(low, [[0, 7], [30, 7], [40, 9], [50, 9], [59, 9], [60, 9]]);
    expect(changes).toEqual([[30, 'activate'], [60, 'clear']]);
  });

  it('when the value dips back into the deadband during the off-delay, then the off-delay restarts', () => {
    const changes = run({ ...low, onDelayS: 0 }, [[0, 7], [10, 9], [25, 8.5], [26, 9], [40, 9], [46, 9]]);
    expect(changes).toEqual([[0, 'activate'], [46, 'clear']]);
  });

  it('when a sample is missing, then timers are kept and nothing changes', () => {
    expect(run(low, [[0, 7], [10, null], [30, 7]])).toEqual([[30, 'activate']]);
  });

  it('when a high alarm has an absolute deadband, then it clears only below limit minus deadband', () => {
    const high: ConditionSettings = { direction: 'high', limit: 680, deadband: 5, onDelayS: 0, offDelayS: 0 };
    expect(run(high, [[0, 681], [1, 679], [2, 676], [3, 674]])).toEqual([[0, 'activate'], [3, 'clear']]);
  });

  it('when the value sits exactly on the limit, then it is normal', () => {
    expect(run({ ...low, onDelayS: 0 }, [[0, 8], [1, 8]])).toEqual([]);
  });

  it('when any value series chatters inside the deadband, then changes alternate and never repeat', () => {
    fc.assert(fc.property(fc.array(fc.double({ min: 6, max: 10, noNaN: true }), { maxLength: 200 }), (values) => {
      const changes = run(low, values.map((v, i) => [i * 5, v]));
      changes.forEach(([, c], i) => expect(c).toBe(i % 2 === 0 ? 'activate' : 'clear'));
    }));
  });
});

describe('window measures', () => {
  const series = (f: (tS: number) => number, seconds: number, stepS = 5): Sample[] =>
    Array.from({ length: Math.floor(seconds / stepS) + 1 }, (_, i) => ({ tMs: i * stepS * 1000, orpMv: f(i * stepS) }));

  it('when samples do not cover the window, then no value is given', () => {
    expect(windowOf(series(() => 500, 60), 60_000, 600)).toBeNull();
    expect(windowedValue('probe-flatline', series(() => 500, 60), 60_000, 600)).toBeNull();
  });

  it('when ORP ramps at 20 mV/min, then the rate is 20 mV/min and the detrended spread is about zero', () => {
    const w = series((t) => 500 + (20 * t) / 60, 120);
    expect(slopeMvPerMin(w)).toBeCloseTo(20, 6);
    expect(spreadMv(w)).toBeCloseTo(40, 6);
    expect(detrendedSpreadMv(w)).toBeCloseTo(0, 6);
  });

  it('when ORP alternates ±20 mV, then the detrended spread is about 40 mV', () => {
    const w = series((t) => 500 + (t % 10 === 0 ? 20 : -20), 120);
    expect(detrendedSpreadMv(w)).toBeGreaterThan(38);
    expect(windowedValue('probe-noisy', w, 120_000, 120)).toBeGreaterThan(38);
  });
});
