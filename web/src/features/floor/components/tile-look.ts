import type { TankAlarmBadge, TankHeldAlarms } from '../../../lib/tank-alarms';
import type { TankStatus } from './tank-status';

/**
 * How a tank's frame reads from across the room. The worst sounding alarm decides colour and
 * shape (P1 thick solid, P2 medium solid, P3 double line); out of band without an alarm yet is
 * a neutral strong line; out of service is hatched and dashed. Marks (shelved, out of service,
 * suppressed) are listed separately so a new one only adds an entry here and in TileMarks.
 */
export type TileMark = 'shelved' | 'out-of-service' | 'suppressed';
export type TileLook = { frame: string; priority: 1 | 2 | 3 | null; marks: TileMark[] };

// Literal class names, so Tailwind finds them in the source.
const ALARM_FRAME: Record<1 | 2 | 3, string> = {
  1: 'border-[5px] border-attention-1',
  2: 'border-[3px] border-attention-2',
  3: 'border-[4px] border-double border-attention-3',
};

export function tileLook(status: TankStatus, alarm: TankAlarmBadge | undefined, held: TankHeldAlarms | undefined): TileLook {
  const marks: TileMark[] = [];
  if (held?.shelved) marks.push('shelved');
  if (held?.outOfService) marks.push('out-of-service');
  if (held?.suppressed) marks.push('suppressed');
  if (status.kind === 'offline') return { frame: 'hatch border-2 border-dashed border-line-strong', priority: alarm?.priority ?? null, marks };
  if (alarm) return { frame: ALARM_FRAME[alarm.priority], priority: alarm.priority, marks };
  const out = status.kind === 'live' && status.position !== 'in';
  return { frame: out ? 'border-2 border-line-strong' : 'border border-line', priority: null, marks };
}

const MARK_WORDS: Record<TileMark, string> = { shelved: 'an alarm shelved', 'out-of-service': 'an alarm out of service', suppressed: 'alarms suppressed' };

/** The marks in words, for the tile's accessible name ("" when none). */
export const marksText = (marks: TileMark[]): string => (marks.length ? ` Held: ${marks.map((m) => MARK_WORDS[m]).join(', ')}.` : '');

/** Worst first: sounding priority, then waiting for acknowledgement, then how far out of band, then not live. */
export function worstFirst(a: { status: TankStatus; alarm?: TankAlarmBadge }, b: { status: TankStatus; alarm?: TankAlarmBadge }): number {
  const p = (x: typeof a) => x.alarm?.priority ?? 4;
  const notLive = (x: typeof a) => (x.status.kind === 'live' ? 0 : 1);
  return p(a) - p(b) || (b.alarm?.unacknowledged ?? 0) - (a.alarm?.unacknowledged ?? 0) || b.status.decadesOut - a.status.decadesOut || notLive(b) - notLive(a);
}
