import { describe, expect, it } from 'vitest';
import { parseSamplingTime } from '../../api/src/modules/assays/sampling-time.ts';
import {
  addDays, isoToSiteLocal, localDateOf, siteLocalToIso, wallTimeOf, zoneOffsetMs, zonedTimeToUtc,
} from '../../shared/time/site-time.ts';
import { formatClock, formatDateTime } from '../../web/src/lib/format.ts';

// Offsets and change dates: IANA tz database.
// - America/New_York: EST −5 / EDT −4; 2026 summer time from Sunday 8 March 02:00 to Sunday 1 November 02:00
//   (US rule: second Sunday of March, first Sunday of November, Energy Policy Act of 2005).
// - Australia/Sydney: AEST +10 / AEDT +11; summer time ends Sunday 5 April 2026 03:00 and starts
//   Sunday 4 October 2026 02:00 (NSW rule: first Sunday of April and of October).
// - Australia/Perth: +8 all year.
const H = 3_600_000;

describe('site time', () => {
  it('when an instant is read in Perth, then its wall clock is 8 h ahead of UTC', () => {
    expect(wallTimeOf(Date.UTC(2026, 11, 1, 0, 0, 5), 'Australia/Perth')).toEqual({ year: 2026, month: 12, day: 1, hour: 8, minute: 0, second: 5 });
    expect(zoneOffsetMs(Date.UTC(2026, 0, 1), 'Australia/Perth')).toBe(8 * H);
    expect(localDateOf(Date.UTC(2026, 10, 30, 16, 0), 'Australia/Perth')).toBe('2026-12-01');
  });

  it('when New York and Sydney change clocks, then the offsets follow the published rules', () => {
    expect(zoneOffsetMs(Date.UTC(2026, 2, 8, 6, 59), 'America/New_York')).toBe(-5 * H);
    expect(zoneOffsetMs(Date.UTC(2026, 2, 8, 7, 0), 'America/New_York')).toBe(-4 * H);
    expect(zoneOffsetMs(Date.UTC(2026, 3, 4, 15, 59), 'Australia/Sydney')).toBe(11 * H);
    expect(zoneOffsetMs(Date.UTC(2026, 3, 4, 16, 0), 'Australia/Sydney')).toBe(10 * H);
  });

  it('when a wall time is skipped by a spring-forward change, then it moves later by the gap in both hemispheres', () => {
    // 02:30 does not exist: 03:30 summer time (Temporal's 'compatible' choice).
    expect(siteLocalToIso('2026-03-08T02:30', 'America/New_York')).toBe('2026-03-08T07:30:00.000Z');
    expect(siteLocalToIso('2026-10-04T02:30', 'Australia/Sydney')).toBe('2026-10-03T16:30:00.000Z');
  });

  it('when a wall time is repeated by a fall-back change, then its first (summer-time) occurrence is taken in both hemispheres', () => {
    expect(siteLocalToIso('2026-11-01T01:30', 'America/New_York')).toBe('2026-11-01T05:30:00.000Z');
    expect(siteLocalToIso('2026-04-05T02:30', 'Australia/Sydney')).toBe('2026-04-04T15:30:00.000Z');
    expect(new Date(zonedTimeToUtc('2026-04-05', 150, 'Australia/Sydney')).toISOString()).toBe('2026-04-04T15:30:00.000Z');
  });

  it('when a datetime-local value goes to an instant and back, then it is unchanged', () => {
    for (const local of ['2026-12-01T08:00', '2026-06-30T23:59', '2026-01-01T00:00']) {
      for (const zone of ['Australia/Perth', 'America/New_York', 'Australia/Sydney', 'UTC']) {
        expect(isoToSiteLocal(siteLocalToIso(local, zone)!, zone)).toBe(local);
      }
    }
    expect(siteLocalToIso('2026-12-01 08:00', 'UTC')).toBeNull();
  });

  it('when days are added across month, year and leap-day ends, then the calendar date is right', () => {
    expect(addDays('2026-12-31', 1)).toBe('2027-01-01');
    expect(addDays('2028-02-28', 1)).toBe('2028-02-29');
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
    expect(addDays('2026-03-28', 2)).toBe('2026-03-30');
  });

  it('when a lab time has no zone, then it is read in site time; with Z or an offset it is exact', () => {
    expect(parseSamplingTime('2026-12-01 08:30', 'Australia/Perth')).toBe(Date.UTC(2026, 11, 1, 0, 30));
    expect(parseSamplingTime('2026-11-01 01:30', 'America/New_York')).toBe(Date.UTC(2026, 10, 1, 5, 30));
    expect(parseSamplingTime('2026-12-01T08:30:00+08:00', 'America/New_York')).toBe(Date.UTC(2026, 11, 1, 0, 30));
    expect(parseSamplingTime('2026-02-30 08:30', 'UTC')).toBe('not a real date and time');
  });

  it('when the screen shows a time, then it is the site wall clock whatever zone the browser is in', () => {
    const ms = Date.UTC(2026, 11, 1, 0, 5, 9);
    expect(formatDateTime(ms, 'Australia/Perth')).toBe('2026-12-01 08:05');
    expect(formatDateTime(new Date(ms).toISOString(), 'America/New_York')).toBe('2026-11-30 19:05');
    expect(formatClock(ms, 'Australia/Perth')).toBe('08:05:09');
  });
});
