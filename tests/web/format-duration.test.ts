import { describe, expect, it } from 'vitest';
import { formatDuration } from '../../web/src/lib/format.ts';

/**
 * Durations on the Alarm desk in their largest sensible unit. The unit sizes are the SI ones
 * (BIPM SI Brochure, 9th ed., table 8: 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s).
 */
describe('durations in the largest sensible unit', () => {
  it('when a response time is 1440 min, then it reads as 24 h, not 1440 min', () => {
    expect(formatDuration(1440 * 60)).toBe('24 h');
  });

  it('when spans cross each unit, then seconds, minutes, hours with minutes and days with hours are used', () => {
    expect(formatDuration(45)).toBe('45 s');
    expect(formatDuration(12 * 60)).toBe('12 min');
    expect(formatDuration(3600 + 30 * 60)).toBe('1 h 30 min');
    expect(formatDuration(2 * 86_400 + 4 * 3600)).toBe('2 d 4 h');
  });

  it('when a span is negative or zero, then it reads 0 s rather than a negative time', () => {
    expect(formatDuration(-5)).toBe('0 s');
    expect(formatDuration(0)).toBe('0 s');
  });
});
