import { KIND_INFO, type AlarmKind } from '@shared/alarms/kinds';
import { formatDateTime } from '../../../lib/format';

/** "12 h 05 min", "45 min", "0 min". */
export function formatMinutes(min: number): string {
  const h = Math.floor(min / 60);
  const m = Math.round(min % 60);
  return h > 0 ? `${h} h ${String(m).padStart(2, '0')} min` : `${m} min`;
}

export function formatPercent(part: number, total: number): string {
  if (total <= 0) return '—';
  const p = (part / total) * 100;
  return p > 0 && p < 1 ? '<1' : String(Math.round(p));
}

/** "4 min 10 s", "52 s"; null as a dash. */
export function formatSeconds(s: number | null): string {
  if (s == null) return '—';
  if (s < 90) return `${Math.round(s)} s`;
  const m = Math.floor(s / 60);
  return m < 90 ? `${m} min ${String(Math.round(s % 60)).padStart(2, '0')} s` : `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`;
}

/** "2026-12-01 06:00 → 18:00" or "2026-12-01 06:00 → 2026-12-08 06:00", in site time. */
export function formatRange(fromIso: string, toIso: string, timeZone: string): string {
  const a = formatDateTime(fromIso, timeZone);
  const b = formatDateTime(toIso, timeZone);
  return a.slice(0, 10) === b.slice(0, 10) ? `${a} → ${b.slice(11)}` : `${a} → ${b}`;
}

/** The Alarm desk's own words for an alarm kind; unknown kinds as stored. */
export function alarmKindLabel(kind: string | null): string {
  return kind ? (KIND_INFO[kind as AlarmKind]?.label ?? kind) : '';
}
