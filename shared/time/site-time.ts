/**
 * Wall-clock time at a site ↔ instants, for an IANA time zone. Operators, shift patterns and lab
 * exports think in site time even when the browser or the server sits in another zone. The zone
 * data comes from @date-fns/tz (Intl underneath, so browser and Node agree); which instant a
 * skipped or repeated wall time means is decided here, once.
 */
import { TZDate, tzOffset } from '@date-fns/tz';
import { addDays as addCalendarDays, format } from 'date-fns';

/** Wall-clock fields of an instant in a zone (month 1–12). */
export type WallTime = { year: number; month: number; day: number; hour: number; minute: number; second: number };

export function wallTimeOf(utcMs: number, timeZone: string): WallTime {
  const t = new TZDate(utcMs, timeZone);
  return { year: t.getFullYear(), month: t.getMonth() + 1, day: t.getDate(), hour: t.getHours(), minute: t.getMinutes(), second: t.getSeconds() };
}

/** Offset of the zone from UTC at an instant, in ms (Perth: +8 h = 28 800 000). */
export function zoneOffsetMs(utcMs: number, timeZone: string): number {
  return tzOffset(timeZone, new Date(utcMs)) * 60_000;
}

/**
 * The instant of a wall-clock time in a zone, given as that wall time read as if it were UTC.
 * Like Temporal's 'compatible' choice: a time skipped by a spring-forward gap moves later by the
 * gap (02:30 → 03:30), and a time repeated by a fall-back takes its first (summer-time) occurrence.
 * The library's own constructor does not pick the same occurrence in every zone, hence the rule here.
 */
export function wallToUtc(wallAsUtcMs: number, timeZone: string): number {
  const before = zoneOffsetMs(wallAsUtcMs - 86_400_000, timeZone);
  const after = zoneOffsetMs(wallAsUtcMs + 86_400_000, timeZone);
  const valid = [wallAsUtcMs - before, wallAsUtcMs - after].filter((t) => t + zoneOffsetMs(t, timeZone) === wallAsUtcMs);
  if (valid.length > 0) return Math.min(...valid);
  // In a gap: the offset from before the change lands the same distance past it.
  return wallAsUtcMs - before;
}

/**
 * The instant a wall-clock time happens in a zone (see wallToUtc for skipped and repeated times).
 * @param minuteOfDay minutes after local midnight; may exceed 1439 to run into later days
 */
export function zonedTimeToUtc(date: string, minuteOfDay: number, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number);
  return wallToUtc(Date.UTC(y, m - 1, d, 0, minuteOfDay), timeZone);
}

/** 'YYYY-MM-DD' of an instant in a zone. */
export function localDateOf(utcMs: number, timeZone: string): string {
  return format(new TZDate(utcMs, timeZone), 'yyyy-MM-dd');
}

/** Calendar arithmetic on 'YYYY-MM-DD' (no zone involved). */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return format(addCalendarDays(new TZDate(y, m - 1, d, 'UTC'), days), 'yyyy-MM-dd');
}

/** "2026-12-01T08:00" read as site time → ISO instant; null when not a valid value. */
export function siteLocalToIso(local: string, timeZone: string): string | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(local);
  if (!m) return null;
  const t = wallToUtc(Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5]), timeZone);
  return Number.isFinite(t) ? new Date(t).toISOString() : null;
}

/** ISO instant → "2026-12-01T08:00" in site time, for a datetime-local input. */
export function isoToSiteLocal(iso: string | number, timeZone: string): string {
  const ms = typeof iso === 'number' ? iso : Date.parse(iso);
  return format(new TZDate(ms, timeZone), "yyyy-MM-dd'T'HH:mm");
}
