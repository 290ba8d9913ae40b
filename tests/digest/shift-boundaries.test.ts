import { describe, expect, it } from 'vitest';
import { neighbourShift, shiftAt, shiftsBetween, shiftsOfDay, type ShiftPattern } from '../../shared/shifts/shift-boundaries.ts';
import { localDateOf, zoneOffsetMs, zonedTimeToUtc } from '../../shared/time/site-time.ts';

const iso = (ms: number) => new Date(ms).toISOString().slice(0, 16);
const hours = (s: { startsAtMs: number; endsAtMs: number }) => (s.endsAtMs - s.startsAtMs) / 3_600_000;
const twelve = (start: number): ShiftPattern => ({ shiftsPerDay: 2, firstStartMin: start * 60 });
const eight = (start: number): ShiftPattern => ({ shiftsPerDay: 3, firstStartMin: start * 60 });

// Offsets and DST dates: IANA tz database (Australia/Perth UTC+8 all year; Europe/Madrid CET/CEST,
// summer time from 2026-03-29 02:00 to 2026-10-25 03:00 local, EU rule "last Sunday").
describe('shift boundaries', () => {
  it('when the site is in Perth, then two 12-h shifts from 06:00 start at 22:00 and 10:00 UTC', () => {
    const [day, night] = shiftsOfDay('2026-12-01', twelve(6), 'Australia/Perth');
    expect([iso(day.startsAtMs), iso(day.endsAtMs), iso(night.endsAtMs)]).toEqual(['2026-11-30T22:00', '2026-12-01T10:00', '2026-12-01T22:00']);
    expect(zoneOffsetMs(Date.UTC(2026, 6, 1), 'Australia/Perth')).toBe(8 * 3_600_000);
  });

  it('when Madrid moves to summer time, then the 12-h night shift lasts 11 h and handovers stay at 07:00 and 19:00', () => {
    const [day, night] = shiftsOfDay('2026-03-28', twelve(7), 'Europe/Madrid');
    expect([iso(day.startsAtMs), iso(night.startsAtMs), iso(night.endsAtMs)]).toEqual(['2026-03-28T06:00', '2026-03-28T18:00', '2026-03-29T05:00']);
    expect(hours(night)).toBe(11);
  });

  it('when Madrid moves back to winter time, then the 12-h night shift lasts 13 h', () => {
    const night = shiftsOfDay('2026-10-24', twelve(7), 'Europe/Madrid')[1];
    expect([iso(night.startsAtMs), iso(night.endsAtMs)]).toEqual(['2026-10-24T17:00', '2026-10-25T06:00']);
    expect(hours(night)).toBe(13);
  });

  it('when three 8-h shifts span the spring change, then the night shift lasts 7 h and the day still adds up', () => {
    const before = shiftsOfDay('2026-03-28', eight(6), 'Europe/Madrid');
    expect(before.map(hours)).toEqual([8, 8, 7]);
    const after = shiftsOfDay('2026-03-29', eight(6), 'Europe/Madrid');
    expect(after.map((s) => iso(s.startsAtMs))).toEqual(['2026-03-29T04:00', '2026-03-29T12:00', '2026-03-29T20:00']);
    expect(after.map(hours)).toEqual([8, 8, 8]);
  });

  it('when a start time falls in the skipped hour or the repeated hour, then it moves past the gap or takes the first occurrence', () => {
    expect(iso(zonedTimeToUtc('2026-03-29', 150, 'Europe/Madrid'))).toBe('2026-03-29T01:30');
    expect(iso(zonedTimeToUtc('2026-10-25', 150, 'Europe/Madrid'))).toBe('2026-10-25T00:30');
    expect(localDateOf(Date.UTC(2026, 2, 28, 23, 30), 'Europe/Madrid')).toBe('2026-03-29');
  });

  it('when an instant is before the first start of its local day, then it belongs to the previous day’s last shift', () => {
    const s = shiftAt(Date.UTC(2026, 2, 29, 3, 0), twelve(7), 'Europe/Madrid');
    expect(s).toMatchObject({ day: '2026-03-28', index: 1 });
    expect(iso(neighbourShift(s, 1, twelve(7), 'Europe/Madrid').startsAtMs)).toBe('2026-03-29T05:00');
    expect(iso(neighbourShift(s, -1, twelve(7), 'Europe/Madrid').startsAtMs)).toBe('2026-03-28T06:00');
  });

  it('when shifts start late in the evening, then the pattern day runs into the next date', () => {
    const s = shiftsOfDay('2026-12-01', eight(22), 'Australia/Perth');
    expect(s.map((x) => iso(x.startsAtMs))).toEqual(['2026-12-01T14:00', '2026-12-01T22:00', '2026-12-02T06:00']);
    expect(shiftAt(Date.UTC(2026, 11, 2, 7), eight(22), 'Australia/Perth')).toMatchObject({ day: '2026-12-01', index: 2 });
  });

  it('when listing a week across a change, then shifts tile the range without gaps or overlaps', () => {
    const list = shiftsBetween(Date.UTC(2026, 9, 21), Date.UTC(2026, 9, 28), twelve(7), 'Europe/Madrid');
    for (let i = 1; i < list.length; i += 1) expect(list[i].startsAtMs).toBe(list[i - 1].endsAtMs);
    expect(list.reduce((sum, s) => sum + hours(s), 0)).toBe(hours({ startsAtMs: list[0].startsAtMs, endsAtMs: list[list.length - 1].endsAtMs }));
    expect(list.filter((s) => hours(s) === 13)).toHaveLength(1);
  });
});
