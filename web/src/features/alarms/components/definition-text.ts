import { KIND_INFO } from '@shared/alarms/kinds';
import type { DefinitionView } from '@shared/schemas/alarms';
import { formatRatio } from '../../../lib/format';

/** Where a definition trips: "below 8.0 (band low)", "above 680 mV". */
export function tripText(d: DefinitionView): string {
  const info = KIND_INFO[d.kind];
  const side = info.direction === 'low' ? 'below' : 'above';
  if (info.limitFrom === 'threshold') return `${side} ${d.threshold ?? '—'}${d.unit ? ` ${d.unit}` : ''}`;
  return `${side} ${formatRatio(d.limit)} (band ${info.limitFrom === 'band-low' ? 'low' : 'high'})`;
}

/** Delays and windows: whole minutes read better than seconds once they are a minute or more. */
export function secondsText(s: number | null): string {
  if (s === null) return '—';
  return s >= 60 && s % 60 === 0 ? `${s / 60} min` : `${s} s`;
}

export const deadbandText = (d: DefinitionView) => `${d.deadband} ${d.deadbandUnit}`;
