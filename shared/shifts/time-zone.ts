/**
 * Wall-clock ↔ UTC conversion for an IANA time zone with nothing but Intl, so the browser and
 * the API agree without a time-zone library. Pure; formatters are cached per zone.
 */
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit',
      hour: '2-digit', minute: '2-digit', second: '2-digit',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/** Wall-clock fields of an instant in a zone (month 1–12). */
export type WallTime = { year: number; month: number; day: number; hour: number; minute: number; second: number };

export function wallTimeOf(utcMs: number, timeZone: string): WallTime {
  const out: Record<string, number> = {};
  for (const p of formatter(timeZone).formatToParts(utcMs)) if (p.type !== 'literal') out[p.type] = Number(p.value);
  return { year: out.year, month: out.month, day: out.day, hour: out.hour % 24, minute: out.minute, second: out.second };
}

/** Offset of the zone from UTC at an instant, in ms (Perth: +8 h = 28 800 000). */
export function zoneOffsetMs(utcMs: number, timeZone: string): number {
  const w = wallTimeOf(utcMs, timeZone);
  const asUtc = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
  return asUtc - Math.floor(utcMs / 1000) * 1000;
}

/** True when Intl knows the zone name. */
export function isTimeZone(name: string): boolean {
  try {
    formatter(name);
    return true;
  } catch {
    return false;
  }
}

/**
 * The instant a wall-clock time happens in a zone. Like Temporal's 'compatible' choice:
 * a time skipped by a spring-forward gap moves later by the gap (02:30 → 03:30), and a
 * time repeated by a fall-back takes its first (summer-time) occurrence.
 * @param minuteOfDay minutes after local midnight; may exceed 1439 to run into later days
 */
export function zonedTimeToUtc(date: string, minuteOfDay: number, timeZone: string): number {
  const [y, m, d] = date.split('-').map(Number);
  const wall = Date.UTC(y, m - 1, d, 0, minuteOfDay);
  const before = zoneOffsetMs(wall - 86_400_000, timeZone);
  const after = zoneOffsetMs(wall + 86_400_000, timeZone);
  const valid = [wall - before, wall - after].filter((t) => t + zoneOffsetMs(t, timeZone) === wall);
  if (valid.length > 0) return Math.min(...valid);
  // In a gap: the offset from before the change lands the same distance past it.
  return wall - before;
}

/** 'YYYY-MM-DD' of an instant in a zone. */
export function localDateOf(utcMs: number, timeZone: string): string {
  const w = wallTimeOf(utcMs, timeZone);
  return `${w.year}-${String(w.month).padStart(2, '0')}-${String(w.day).padStart(2, '0')}`;
}

/** Calendar arithmetic on 'YYYY-MM-DD' (no zone involved). */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number);
  return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}
