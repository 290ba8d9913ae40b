/**
 * Alarm-management targets, each with its published source.
 * confidence 'S': seen in the named source; 'M': unverified — shown to users as common practice
 * (never with an unconfirmed citation) and never used as a test check value until confirmed.
 */
export type Target = { value: number; source: string; confidence: 'S' | 'M' };

const EEMUA = 'EEMUA 191 via published benchmarking';
const ISA = 'ISA-18.2';

export const ALARM_TARGETS = {
  /** Alarms per 10 minutes per operator position in normal operation: the aim is under 1. */
  per10MinAim: { value: 1, source: EEMUA, confidence: 'S' },
  /** 1–2 per 10 minutes is manageable. */
  per10MinManageable: { value: 2, source: EEMUA, confidence: 'S' },
  /** About 6 per hour acceptable. */
  perHourAcceptable: { value: 6, source: ISA, confidence: 'M' },
  /** 12 per hour maximum manageable. */
  perHourMax: { value: 12, source: ISA, confidence: 'M' },
  /** A flood starts above 10 alarms in 10 minutes … */
  floodStartPer10Min: { value: 10, source: ISA, confidence: 'M' },
  /** … and ends below 5 alarms in 10 minutes. */
  floodEndPer10Min: { value: 5, source: ISA, confidence: 'M' },
  /** Chattering: 3 or more transitions into alarm within 60 s (a working rule). */
  chatterCount: { value: 3, source: 'common practice', confidence: 'M' },
  chatterWindowS: { value: 60, source: 'common practice', confidence: 'M' },
  /** Stale: active for more than 24 h. */
  staleHours: { value: 24, source: ISA, confidence: 'M' },
  /** Priority mix, share of alarms: about 5 % high, 15 % medium, 80 % low. */
  mixHigh: { value: 0.05, source: ISA, confidence: 'M' },
  mixMedium: { value: 0.15, source: ISA, confidence: 'M' },
  mixLow: { value: 0.8, source: ISA, confidence: 'M' },
} as const satisfies Record<string, Target>;

/** What a label on screen says: the publication where the value was seen, otherwise "common practice". */
export function sourceNote(t: Target): string {
  return t.confidence === 'S' ? t.source : 'common practice';
}
