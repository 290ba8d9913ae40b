import { ANNUNCIATED, UNACKNOWLEDGED, type AlarmState } from '@shared/alarms/states';
import type { AlarmView } from '@shared/schemas/alarms';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';

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
export const isUnacknowledged = (s: AlarmState) => UNACKNOWLEDGED.includes(s);

/** A measured value in its kind's unit, with the house display rules (see lib/format.ts). */
export function formatAlarmValue(kind: AlarmView['kind'], v: number | null): string {
  if (v === null) return '—';
  if (kind === 'ratio-below-band' || kind === 'ratio-above-band') return formatRatio(v);
  if (kind === 'orp-low' || kind === 'orp-high' || kind === 'calibration-drift') return formatMv(v);
  if (kind === 'temp-low' || kind === 'temp-high') return formatTempC(v);
  return v >= 100 ? String(Math.round(v)) : v.toFixed(1);
}

/** "6.2 (limit 8.0)" style text for tables and the timeline. */
export function valueText(a: Pick<AlarmView, 'kind' | 'unit'>, value: number | null, limit: number | null): string {
  const unit = a.unit ? ` ${a.unit}` : '';
  return `${formatAlarmValue(a.kind, value)}${value === null ? '' : unit}${limit === null ? '' : ` (limit ${formatAlarmValue(a.kind, limit)})`}`;
}
