/** Display rules: ratio 2 significant figures below 10, integer above; mV integer; °C one decimal. */
import { TZDate } from '@date-fns/tz';
import { format } from 'date-fns';

const MINUS = '\u2212';

function signed(text: string, value: number): string {
  if (value > 0) return `+${text}`;
  return value < 0 ? `${MINUS}${text.replace('-', '')}` : text;
}

export function formatRatio(ratio: number | null | undefined): string {
  if (ratio == null || !Number.isFinite(ratio) || ratio <= 0) return '—';
  if (ratio < 10) {
    // toPrecision switches to exponent notation below 1e-6; ratios that small are flagged anyway.
    return ratio < 1e-4 ? ratio.toExponential(1) : ratio.toPrecision(2);
  }
  return ratio < 1e5 ? String(Math.round(ratio)) : ratio.toExponential(1);
}

/** ORP in mV with an explicit sign (operators read "+412", not "412"). */
export function formatMv(mv: number | null | undefined): string {
  if (mv == null || !Number.isFinite(mv)) return '—';
  const rounded = Math.round(mv);
  return signed(String(Math.abs(rounded)), rounded);
}

export function formatEhV(v: number | null | undefined): string {
  if (v == null || !Number.isFinite(v)) return '—';
  const text = Math.abs(v).toFixed(3);
  return v < 0 && text !== '0.000' ? `${MINUS}${text}` : text;
}

export function formatTempC(t: number | null | undefined): string {
  if (t == null || !Number.isFinite(t)) return '—';
  const text = Math.abs(t).toFixed(1);
  return t < 0 && text !== '0.0' ? `${MINUS}${text}` : text;
}

/** A band in mV: "558–589" when both ends are positive, signed ends otherwise ("−12 to +30"). */
export function formatMvRange(lowMv: number, highMv: number): string {
  const lo = Math.round(lowMv);
  const hi = Math.round(highMv);
  return lo >= 0 && hi >= 0 ? `${lo}–${hi}` : `${formatMv(lo)} to ${formatMv(hi)}`;
}

/** A fixed number of decimals with a true minus sign; for coefficients and potentials in facts. */
export function formatFixed(v: number | null | undefined, decimals: number): string {
  if (v == null || !Number.isFinite(v)) return '—';
  const text = Math.abs(v).toFixed(decimals);
  return v < 0 && Number(text) !== 0 ? `${MINUS}${text}` : text;
}

/** "12 s ago", "4 min ago", "3 h ago", "2 d ago". */
export function formatAge(ageS: number): string {
  const s = Math.max(0, Math.round(ageS));
  if (s < 90) return `${s} s ago`;
  const min = Math.round(s / 60);
  if (min < 90) return `${min} min ago`;
  const h = Math.round(s / 3600);
  if (h < 48) return `${h} h ago`;
  return `${Math.round(s / 86_400)} d ago`;
}

/** "14:32:05" in the site's time zone. */
export function formatClock(ms: number, timeZone: string): string {
  return format(new TZDate(ms, timeZone), 'HH:mm:ss');
}

/** "2026-12-01 08:00" in the site's time zone (ISO-like, unambiguous across locales). */
export function formatDateTime(iso: string | number, timeZone: string): string {
  return format(new TZDate(typeof iso === 'number' ? iso : Date.parse(iso), timeZone), 'yyyy-MM-dd HH:mm');
}

export function formatDate(iso: string, timeZone: string): string {
  return formatDateTime(iso, timeZone).slice(0, 10);
}

/** "UTC+8" style offset label for a time zone at a moment. */
export function formatUtcOffset(ms: number, timeZone: string): string {
  const part = new Intl.DateTimeFormat('en-GB', { timeZone, timeZoneName: 'shortOffset' })
    .formatToParts(ms)
    .find((p) => p.type === 'timeZoneName');
  return part?.value.replace('GMT', 'UTC') || 'UTC';
}

/** A span in its largest sensible unit: "45 s", "12 min", "1 h 30 min", "24 h", "2 d 4 h". */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  if (s < 90) return `${s} s`;
  const totalMin = Math.round(s / 60);
  if (totalMin < 60) return `${totalMin} min`;
  if (totalMin < 48 * 60) {
    const h = Math.floor(totalMin / 60);
    const m = totalMin % 60;
    return m ? `${h} h ${m} min` : `${h} h`;
  }
  const totalH = Math.round(totalMin / 60);
  const d = Math.floor(totalH / 24);
  const h = totalH % 24;
  return h ? `${d} d ${h} h` : `${d} d`;
}
