import { addDays, localDateOf, zonedTimeToUtc } from '../time/site-time.ts';

/** A site's shift pattern: equal shifts by the wall clock, the first starting firstStartMin after local midnight. */
export type ShiftPattern = { shiftsPerDay: 2 | 3; firstStartMin: number };

/** One shift: [startsAtMs, endsAtMs) in UTC; `day` is the local date its pattern day began on. */
export type ShiftWindow = { day: string; index: number; startsAtMs: number; endsAtMs: number };

const DAY_MIN = 1440;

/** 'HH:MM' → minutes after midnight. */
export function parseClock(hhmm: string): number {
  const [h, m] = hhmm.split(':').map(Number);
  return h * 60 + m;
}

export function formatClockMin(min: number): string {
  const m = ((min % DAY_MIN) + DAY_MIN) % DAY_MIN;
  return `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
}

function startOf(day: string, index: number, p: ShiftPattern, timeZone: string): number {
  return zonedTimeToUtc(day, p.firstStartMin + (index * DAY_MIN) / p.shiftsPerDay, timeZone);
}

/**
 * The shifts of one pattern day. Boundaries follow the site's wall clock, so across a DST
 * change the shift that spans it is an hour shorter or longer (e.g. a 12-h night shift in
 * Madrid lasts 11 h in March and 13 h in October) while every handover stays at its usual time.
 */
export function shiftsOfDay(day: string, p: ShiftPattern, timeZone: string): ShiftWindow[] {
  const out: ShiftWindow[] = [];
  for (let i = 0; i < p.shiftsPerDay; i += 1) {
    const endsAtMs = i + 1 < p.shiftsPerDay ? startOf(day, i + 1, p, timeZone) : startOf(addDays(day, 1), 0, p, timeZone);
    out.push({ day, index: i, startsAtMs: startOf(day, i, p, timeZone), endsAtMs });
  }
  return out;
}

/** The shift that contains an instant. */
export function shiftAt(utcMs: number, p: ShiftPattern, timeZone: string): ShiftWindow {
  const local = localDateOf(utcMs, timeZone);
  // A pattern day starts on its own date, so the instant lies in that day's shifts or the day before's.
  for (const day of [local, addDays(local, -1), addDays(local, 1)]) {
    const hit = shiftsOfDay(day, p, timeZone).find((s) => s.startsAtMs <= utcMs && utcMs < s.endsAtMs);
    if (hit) return hit;
  }
  throw new Error(`no shift contains ${new Date(utcMs).toISOString()} in ${timeZone}`);
}

/** The shift after (step 1) or before (step −1) a given one. */
export function neighbourShift(s: ShiftWindow, step: 1 | -1, p: ShiftPattern, timeZone: string): ShiftWindow {
  return shiftAt(step === 1 ? s.endsAtMs : s.startsAtMs - 1, p, timeZone);
}

/** Shifts overlapping [fromMs, toMs), oldest first. */
export function shiftsBetween(fromMs: number, toMs: number, p: ShiftPattern, timeZone: string): ShiftWindow[] {
  const out: ShiftWindow[] = [];
  for (let s = shiftAt(fromMs, p, timeZone); s.startsAtMs < toMs; s = neighbourShift(s, 1, p, timeZone)) out.push(s);
  return out;
}
