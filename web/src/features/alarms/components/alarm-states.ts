import { ANNUNCIATED, UNACKNOWLEDGED, type AlarmState } from '@shared/alarms/states';
import type { AlarmView } from '@shared/schemas/alarms';
import type { TankLive } from '@shared/schemas/readings';
import { formatDuration, formatMv, formatRatio, formatTempC } from '../../../lib/format';

export const STATE_LABEL: Record<AlarmState, string> = {
  normal: 'Normal',
  unacknowledged: 'Unacknowledged',
  acknowledged: 'Acknowledged',
  'rtn-unacknowledged': 'Back to normal, unacknowledged',
  shelved: 'Shelved',
  'out-of-service': 'Out of service',
  suppressed: 'Suppressed: tank offline',
};

export const isAnnunciated = (s: AlarmState) => ANNUNCIATED.includes(s);
/** Where an alarm is: its tank, or the whole plant for an alarm about Ferrisight itself. */
export const placeOf = (a: { tankTag: string | null }) => a.tankTag ?? 'Plant';
export const isUnacknowledged = (s: AlarmState) => UNACKNOWLEDGED.includes(s);

/** A measured value in its kind's unit, with the house display rules (see lib/format.ts); times in their largest sensible unit. */
export function formatAlarmValue(kind: AlarmView['kind'], v: number | null): string {
  if (v === null) return '—';
  if (kind === 'probe-check-overdue') return v <= 0 ? 'due now' : `${formatDuration(v * 3600)} past due`;
  if (kind === 'ratio-below-band' || kind === 'ratio-above-band') return formatRatio(v);
  if (kind === 'orp-low' || kind === 'orp-high' || kind === 'calibration-drift') return formatMv(v);
  if (kind === 'temp-low' || kind === 'temp-high') return formatTempC(v);
  return v >= 100 ? String(Math.round(v)) : v.toFixed(1);
}

/** "6.2 (limit 8.0)" style text for tables and the timeline; an overdue check reads "3 h past due". */
export function valueText(a: Pick<AlarmView, 'kind' | 'unit'>, value: number | null, limit: number | null): string {
  if (a.kind === 'probe-check-overdue') return formatAlarmValue(a.kind, value);
  if (a.kind === 'ingest-stopped') return value === null ? '—' : `last heartbeat ${formatDuration(value)} ago`;
  const unit = a.unit ? ` ${a.unit}` : '';
  return `${formatAlarmValue(a.kind, value)}${value === null ? '' : unit}${limit === null ? '' : ` (limit ${formatAlarmValue(a.kind, limit)})`}`;
}

/** The tank's value now in the alarm's own measure, where the live feed carries it (ratio, ORP, temperature). */
export function liveValue(kind: AlarmView['kind'], latest: TankLive | null | undefined): number | null {
  if (!latest) return null;
  if (kind === 'ratio-below-band' || kind === 'ratio-above-band') return latest.ratio;
  if (kind === 'orp-low' || kind === 'orp-high') return latest.orpMv;
  if (kind === 'temp-low' || kind === 'temp-high') return latest.tempC;
  return null;
}

/** "3.5 now" beside the value at activation; nothing for kinds the live feed does not carry. */
export function nowText(a: Pick<AlarmView, 'kind' | 'unit'>, latest: TankLive | null | undefined): string | null {
  const v = liveValue(a.kind, latest);
  return v === null ? null : `${formatAlarmValue(a.kind, v)}${a.unit ? ` ${a.unit}` : ''}`;
}
