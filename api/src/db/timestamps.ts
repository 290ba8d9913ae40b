/**
 * Timestamp text on the ingest hot path, where every reading is parsed once and formatted two or
 * three times. Readings in a flush mostly share their second, so each function keeps the text (or
 * the epoch value) of the last second it saw and only handles the milliseconds; every other
 * input takes the full Date path. Each gives exactly what Date gives (tests/api/db/timestamps.test.ts).
 */

let lastSecond = NaN;
let lastPrefix = '';

/**
 * UTC epoch milliseconds → 'YYYY-MM-DD HH:MM:SS.mmm', the only timestamp form sent to MariaDB.
 * On the ingest hot path (a few per reading) consecutive calls mostly fall in the same second,
 * so the date-and-time part of the last second is reused and only the milliseconds appended.
 */
export function toSqlTs(epochMs: number): string {
  const ms = Math.trunc(epochMs); // as Date does
  const second = Math.floor(ms / 1000);
  if (second !== lastSecond) {
    const iso = new Date(second * 1000).toISOString();
    if (iso.length !== 24) return new Date(ms).toISOString().slice(0, 23).replace('T', ' '); // years outside 0000–9999
    lastSecond = second;
    lastPrefix = `${iso.slice(0, 10)} ${iso.slice(11, 19)}.`;
  }
  return lastPrefix + String(ms - second * 1000).padStart(3, '0');
}

/** 'YYYY-MM-DD HH:MM:SS[.mmm]' (UTC) → epoch milliseconds. */
export function fromSqlTs(sqlTs: string): number {
  return Date.parse(`${sqlTs.replace(' ', 'T')}Z`);
}

let isoSecond = NaN;
let isoPrefix = '';

/** UTC epoch milliseconds → 'YYYY-MM-DDTHH:MM:SS.mmmZ', as Date#toISOString. */
export function toIsoTs(epochMs: number): string {
  const ms = Math.trunc(epochMs);
  const second = Math.floor(ms / 1000);
  if (second !== isoSecond) {
    const iso = new Date(second * 1000).toISOString();
    if (iso.length !== 24) return new Date(ms).toISOString(); // years outside 0000–9999
    isoSecond = second;
    isoPrefix = iso.slice(0, 20);
  }
  return `${isoPrefix}${String(ms - second * 1000).padStart(3, '0')}Z`;
}

let parsedPrefix = '';
let parsedSecondMs = NaN;
const digit = (s: string, i: number) => {
  const d = s.charCodeAt(i) - 48;
  return d >= 0 && d <= 9 ? d : NaN;
};

/**
 * Date.parse for device timestamps. 'YYYY-MM-DDTHH:MM:SS.mmmZ' within the last second seen
 * (by its first 20 characters) costs three digit reads; anything else is parsed by Date.
 */
export function parseIsoTs(ts: string): number {
  if (ts.length === 24 && parsedPrefix !== '' && ts.charCodeAt(23) === 90 /* Z */ && ts.startsWith(parsedPrefix)) {
    const ms = digit(ts, 20) * 100 + digit(ts, 21) * 10 + digit(ts, 22);
    if (Number.isFinite(ms)) return parsedSecondMs + ms;
  }
  const value = Date.parse(ts);
  if (ts.length === 24 && ts.charCodeAt(19) === 46 /* . */ && ts.charCodeAt(23) === 90 && Number.isFinite(value)) {
    const ms = digit(ts, 20) * 100 + digit(ts, 21) * 10 + digit(ts, 22);
    if (Number.isFinite(ms)) {
      parsedPrefix = ts.slice(0, 20);
      parsedSecondMs = value - ms;
    }
  }
  return value;
}
