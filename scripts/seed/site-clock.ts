/** Wall-clock arithmetic in the site's time zone with nothing but Intl (the demo site is in Perth). */
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-GB', {
      timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

export type LocalTime = { year: number; month: number; day: number; hour: number; minute: number };

export function localTime(utcMs: number, timeZone: string): LocalTime {
  const parts = Object.fromEntries(formatter(timeZone).formatToParts(utcMs).map((p) => [p.type, Number(p.value)]));
  return { year: parts.year, month: parts.month, day: parts.day, hour: parts.hour % 24, minute: parts.minute };
}

/** 'HH:MM' in the site's time zone. */
export function clockText(utcMs: number, timeZone: string): string {
  const t = localTime(utcMs, timeZone);
  return `${String(t.hour).padStart(2, '0')}:${String(t.minute).padStart(2, '0')}`;
}

/** UTC instant of a wall-clock time on the local date of `nearMs` shifted by `dayOffset` days. */
export function atLocal(nearMs: number, dayOffset: number, hour: number, minute: number, timeZone: string): number {
  const d = localTime(nearMs, timeZone);
  const guess = Date.UTC(d.year, d.month - 1, d.day + dayOffset, hour, minute);
  // Two corrections settle the zone offset, also next to a daylight-saving change.
  let ms = guess;
  for (let i = 0; i < 2; i += 1) {
    const l = localTime(ms, timeZone);
    ms += guess - Date.UTC(l.year, l.month - 1, l.day, l.hour, l.minute);
  }
  return ms;
}
