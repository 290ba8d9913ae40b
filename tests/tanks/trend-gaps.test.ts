import { describe, expect, it } from 'vitest';
import type { TrendResponse } from '../../shared/schemas/plant.ts';
import { expectedStepS, withGaps } from '../../web/src/features/tanks/utils/trend-gaps.ts';

/** Invented trend: raw points every 5 s, then four hours without data (the plant was down), then two more. */
function trend(t: number[]): TrendResponse {
  const v = t.map((_, i) => 10 + i);
  return { tankId: 1, resolution: 'raw', from: '', to: '', t, ratio: v, ratioMin: v, ratioMax: v, orpMv: v.map((x) => 550 + x), tempC: v.map(() => 41) };
}

describe('trend gaps on the Tank page charts', () => {
  it('when readings stop for longer than three probe intervals, then one null point breaks every series there', () => {
    const g = withGaps(trend([0, 5, 10, 14_410, 14_415]), expectedStepS('raw', 5));
    expect(g.t).toEqual([0, 5, 10, 7_210, 14_410, 14_415]);
    expect(g.ratio).toEqual([10, 11, 12, null, 13, 14]);
    expect(g.orpMv[3]).toBeNull();
    expect(g.tempC[3]).toBeNull();
  });

  it('when points are at most three intervals apart (a late or missed reading or two), then nothing is inserted', () => {
    const g = withGaps(trend([0, 5, 15, 30]), expectedStepS('raw', 5));
    expect(g.t).toEqual([0, 5, 15, 30]);
    expect(g.ratio.every((x) => x !== null)).toBe(true);
  });

  it('when the trend is made of 1-minute or 1-hour buckets, then the bucket is the step', () => {
    expect(expectedStepS('1m', 5)).toBe(60);
    expect(expectedStepS('1h', 5)).toBe(3600);
    expect(withGaps({ ...trend([0, 60, 120, 400]), resolution: '1m' }, 60).t).toEqual([0, 60, 120, 260, 400]);
  });

  it('when older readings came less often than the probe is set to report now, then their own spacing is the step', () => {
    // Every 60 s for a while (probe interval now 5 s): no gaps there; 10 min without data is one.
    const g = withGaps(trend([0, 60, 120, 180, 240, 840, 900]), expectedStepS('raw', 5));
    expect(g.t).toEqual([0, 60, 120, 180, 240, 540, 840, 900]);
  });
});
