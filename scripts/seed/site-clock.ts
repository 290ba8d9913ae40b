import { wallTimeOf, wallToUtc } from '../../shared/time/site-time.ts';

/** 'HH:MM' in the site's time zone. */
export function clockText(utcMs: number, timeZone: string): string {
  const t = wallTimeOf(utcMs, timeZone);
  return `${String(t.hour).padStart(2, '0')}:${String(t.minute).padStart(2, '0')}`;
}

/** UTC instant of a wall-clock time on the local date of `nearMs` shifted by `dayOffset` days. */
export function atLocal(nearMs: number, dayOffset: number, hour: number, minute: number, timeZone: string): number {
  const d = wallTimeOf(nearMs, timeZone);
  return wallToUtc(Date.UTC(d.year, d.month - 1, d.day + dayOffset, hour, minute), timeZone);
}
