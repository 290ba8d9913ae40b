import { readingFieldsSchema } from '../../../../shared/schemas/readings.ts';
import type { ImportField } from '../../../../shared/schemas/import.ts';
import { describeIssues, type DecodedReading } from '../readings/decode.ts';
import type { ProbeLookup } from '../readings/probe-cache.ts';

/** The device contract's limits on time, ORP and temperature: an imported row obeys the same ones. */
const fieldsSchema = readingFieldsSchema.pick({ ts: true, orpMv: true, tempC: true });

function toNumber(text: string | undefined): number {
  const t = (text ?? '').trim();
  // Number('') is 0: an empty cell must fail, not read as 0 mV.
  return t === '' ? Number.NaN : Number(t.replace(',', '.'));
}

/**
 * One CSV record → a decoded reading (site taken from the probe) or the reason it is refused.
 * Decimal commas are accepted in numbers since some historians export them.
 */
export function decodeImportRow(record: string[], columns: Record<ImportField, number>, lookup: ProbeLookup): DecodedReading | string {
  const probeTag = (record[columns.probe] ?? '').trim();
  if (!probeTag) return 'probe tag is empty';
  const probe = lookup.probe(probeTag);
  if (!probe) return `unknown probe '${probeTag.slice(0, 40)}'`;
  const parsed = fieldsSchema.safeParse({
    ts: (record[columns.time] ?? '').trim(),
    orpMv: toNumber(record[columns.orpMv]),
    tempC: toNumber(record[columns.tempC]),
  });
  if (!parsed.success) return describeIssues(parsed.error).replace(/Invalid input: expected number, received NaN/g, 'not a number');
  return { siteTag: probe.siteTag, probeTag, ts: parsed.data.ts, orpMv: parsed.data.orpMv, tempC: parsed.data.tempC, seq: 0, index: null };
}

/** A rejected row as kept for download: its line, why, and what it held. */
export type Rejection = { line: number; reason: string; content: string };

export function rejection(line: number, reason: string, record: string[] | string): Rejection {
  const content = typeof record === 'string' ? record : record.join(',');
  return { line, reason: reason.slice(0, 500), content: content.slice(0, 500) };
}
