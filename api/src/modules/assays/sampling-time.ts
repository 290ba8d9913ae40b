/**
 * Lab exports write sampling times as the clock on the lab wall ("2026-12-01 08:30"), not as
 * UTC. Such bare times are read in the site's time zone; times with Z or an offset are exact.
 */
import { wallToUtc } from '../../../../shared/time/site-time.ts';

const BARE = /^(\d{4})-(\d{2})-(\d{2})[ T](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,3}))?)?$/;
const WITH_ZONE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(?::\d{2}(?:\.\d{1,9})?)?(?:Z|[+-]\d{2}:?\d{2})$/i;

/**
 * Parses a sampling time to epoch ms, or returns a message saying what is wrong.
 * @param text ISO 8601 with Z/offset, or 'YYYY-MM-DD HH:MM[:SS]' in the site's zone
 */
export function parseSamplingTime(text: string, timeZone: string): number | string {
  const t = text.trim();
  if (WITH_ZONE.test(t)) {
    const ms = Date.parse(t);
    return Number.isFinite(ms) ? ms : 'not a real date and time';
  }
  const m = BARE.exec(t);
  if (!m) return 'not a date and time: use YYYY-MM-DD HH:MM (site time) or ISO 8601 with Z or an offset';
  const [y, mo, d, h, mi, s] = m.slice(1, 7).map((v) => (v === undefined ? 0 : Number(v)));
  const ms = m[7] ? Number(m[7].padEnd(3, '0')) : 0;
  const wall = Date.UTC(y, mo - 1, d, h, mi, s, ms);
  const back = new Date(wall);
  if (back.getUTCMonth() !== mo - 1 || back.getUTCDate() !== d || h > 23 || mi > 59 || s > 59) return 'not a real date and time';
  return wallToUtc(wall, timeZone);
}
