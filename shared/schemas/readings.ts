import { z } from 'zod';

/** Device contract, MQTT 3.1.1: see README "Connecting probes". */
export const TOPIC_PREFIX = 'ferrisight/v1';
export const INTERNAL_PREFIX = 'ferrisight/internal/v1';
export const MAX_PAYLOAD_BYTES = 256 * 1024;
export const MAX_BATCH_READINGS = 1000;
/** Clock skew allowed for device timestamps ahead of the server. */
export const MAX_FUTURE_SKEW_MS = 60_000;

const tagSchema = z.string().regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{0,39}$/, 'tag: 1–40 letters, digits, _ . -');

/** ISO 8601 with an explicit UTC designator or offset, e.g. 2026-12-01T08:00:00.000Z. */
export const isoTimestampSchema = z.iso.datetime({ offset: true, message: 'ts must be ISO 8601 with Z or an offset' });

export const readingFieldsSchema = z.object({
  ts: isoTimestampSchema,
  orpMv: z.number().finite().min(-2000, 'orpMv must be ≥ −2000 mV').max(2000, 'orpMv must be ≤ 2000 mV'),
  tempC: z.number().finite().min(-10, 'tempC must be ≥ −10 °C').max(150, 'tempC must be ≤ 150 °C'),
  seq: z.number().int().min(0).max(Number.MAX_SAFE_INTEGER),
});

export const readingMessageSchema = readingFieldsSchema.strict();
export type ReadingMessage = z.infer<typeof readingMessageSchema>;

export const batchReadingSchema = readingFieldsSchema.extend({ probe: tagSchema }).strict();
export type BatchReading = z.infer<typeof batchReadingSchema>;

export const batchMessageSchema = z
  .object({ readings: z.array(batchReadingSchema).min(1).max(MAX_BATCH_READINGS, `at most ${MAX_BATCH_READINGS} readings`) })
  .strict();
export type BatchMessage = z.infer<typeof batchMessageSchema>;

export type ParsedTopic =
  | { kind: 'reading'; siteTag: string; probeTag: string }
  | { kind: 'batch'; siteTag: string };

/** Splits a device topic; null when it is not one of ours. */
export function parseTopic(topic: string): ParsedTopic | null {
  const parts = topic.split('/');
  if (parts.length < 4 || `${parts[0]}/${parts[1]}` !== TOPIC_PREFIX) return null;
  const site = parts[2];
  if (!tagSchema.safeParse(site).success) return null;
  if (parts.length === 4 && parts[3] === 'batch') return { kind: 'batch', siteTag: site };
  if (parts.length === 5 && parts[4] === 'reading' && tagSchema.safeParse(parts[3]).success) {
    return { kind: 'reading', siteTag: site, probeTag: parts[3] };
  }
  return null;
}

export const readingTopic = (siteTag: string, probeTag: string) => `${TOPIC_PREFIX}/${siteTag}/${probeTag}/reading`;
export const batchTopic = (siteTag: string) => `${TOPIC_PREFIX}/${siteTag}/batch`;
/** Ingest → API: converted latest values per site (QoS 0, the database stays the record). */
export const latestTopic = (siteTag: string) => `${INTERNAL_PREFIX}/${siteTag}/latest`;

/** A converted reading as stored and pushed to screens. */
export type TankLive = {
  tankId: number;
  probeId: number;
  probeTag: string;
  ts: string;
  orpMv: number;
  tempC: number;
  ehV: number;
  ratio: number;
  ferricFraction: number;
  flag: 'ok' | 'outside-range';
  calibrationVersion: number;
};
