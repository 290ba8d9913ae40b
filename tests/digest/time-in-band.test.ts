import { describe, expect, it } from 'vitest';
import { bandSpansFor } from '../../shared/digest/band-spans.ts';
import { sparkline } from '../../shared/digest/sparkline.ts';
import { minutesIn, percentOf, timeInBand, type MinutePoint } from '../../shared/digest/time-in-band.ts';

const T0 = Date.UTC(2026, 11, 1, 10, 0);
const MIN = 60_000;

/**
 * A hand-built hour, band 8–25:
 *   minutes  0–19  ratio 10  → in band (20)
 *   minutes 20–29  nothing   → no data (10)
 *   minutes 30–39  ratio 30  → above (10)
 *   minutes 40–44  ratio 5   → below (5)
 *   minutes 45–59  ratio 8   → in band, on the lower limit (14), minute 50 missing → no data (1)
 */
function hour(): MinutePoint[] {
  const pts: MinutePoint[] = [];
  const put = (from: number, to: number, ratio: number) => {
    for (let m = from; m <= to; m += 1) if (m !== 50) pts.push({ tMs: T0 + m * MIN, logRatio: Math.log10(ratio) });
  };
  put(0, 19, 10);
  put(30, 39, 30);
  put(40, 44, 5);
  put(45, 59, 8);
  return pts;
}

describe('time in band', () => {
  it('when a series has gaps, then the gaps count as no data and the rest splits by the band', () => {
    const r = timeInBand(hour(), [{ fromMs: T0, low: 8, high: 25 }], T0, T0 + 60 * MIN);
    expect(r).toEqual({ inBand: 34, above: 10, below: 5, noData: 11, total: 60 });
    expect(r.inBand + r.above + r.below + r.noData).toBe(r.total);
    expect(percentOf(r.inBand, r.total)).toBeCloseTo(56.667, 3);
  });

  it('when the band changes mid-hour, then each minute is judged against the band in force at that minute', () => {
    const bands = [{ fromMs: T0, low: 8, high: 25 }, { fromMs: T0 + 30 * MIN, low: 20, high: 40 }];
    expect(timeInBand(hour(), bands, T0, T0 + 60 * MIN)).toEqual({ inBand: 30, above: 0, below: 19, noData: 11, total: 60 });
  });

  it('when there is no data at all, then every minute is no data and none is in band', () => {
    expect(timeInBand([], [{ fromMs: T0, low: 8, high: 25 }], T0, T0 + 60 * MIN)).toEqual({ inBand: 0, above: 0, below: 0, noData: 60, total: 60 });
    expect(percentOf(0, 0)).toBe(0);
  });

  it('when points repeat or lie outside the range, then they are ignored', () => {
    const pts = [
      { tMs: T0 - MIN, logRatio: 1 }, { tMs: T0, logRatio: 1 }, { tMs: T0, logRatio: 2 }, { tMs: T0 + MIN, logRatio: Number.NaN },
      { tMs: T0 + 2 * MIN, logRatio: 2 }, { tMs: T0 + 3 * MIN, logRatio: 0 },
    ];
    expect(timeInBand(pts, [{ fromMs: T0, low: 8, high: 25 }], T0, T0 + 3 * MIN)).toEqual({ inBand: 1, above: 1, below: 0, noData: 1, total: 3 });
  });

  it('when the range does not start on a minute, then only minutes starting inside it count', () => {
    expect(minutesIn(T0 + 30_000, T0 + 10 * MIN)).toBe(9);
    expect(minutesIn(T0, T0 + 10 * MIN + 1)).toBe(11);
  });
});

describe('band in force', () => {
  const change = (atMin: number, old: [number, number], next: [number, number]) =>
    ({ effectiveMs: T0 + atMin * MIN, old: { low: old[0], high: old[1] }, next: { low: next[0], high: next[1] } });

  it('when no change is on record, then the current band covers the whole range', () => {
    expect(bandSpansFor([], { low: 8, high: 25 }, T0, T0 + 60 * MIN)).toEqual([{ fromMs: T0, low: 8, high: 25 }]);
  });

  it('when the only change comes after the start, then the range starts on its old band', () => {
    expect(bandSpansFor([change(30, [5, 20], [8, 25])], { low: 8, high: 25 }, T0, T0 + 60 * MIN))
      .toEqual([{ fromMs: T0, low: 5, high: 20 }, { fromMs: T0 + 30 * MIN, low: 8, high: 25 }]);
  });

  it('when changes fall before, inside and after the range, then only the last before and those inside matter', () => {
    const spans = bandSpansFor([change(90, [9, 30], [10, 30]), change(-10, [1, 2], [7, 20]), change(20, [7, 20], [9, 30])], { low: 10, high: 30 }, T0, T0 + 60 * MIN);
    expect(spans).toEqual([{ fromMs: T0, low: 7, high: 20 }, { fromMs: T0 + 20 * MIN, low: 9, high: 30 }]);
  });
});

describe('sparkline', () => {
  it('when minutes are thinned into slots, then each slot is the mean log ratio and empty slots stay null', () => {
    const s = sparkline(hour(), T0, T0 + 60 * MIN, 6);
    expect(s.t).toEqual([0, 10, 20, 30, 40, 50].map((m) => (T0 + m * MIN) / 1000));
    expect(s.logRatio[0]).toBeCloseTo(1, 12);
    expect(s.logRatio[2]).toBeNull();
    expect(s.logRatio[4]).toBeCloseTo((5 * Math.log10(5) + 5 * Math.log10(8)) / 10, 12);
  });
});
