import { z } from 'zod';
import { READING_FLAGS } from '../redox/nernst.ts';

/** Device contract, MQTT 3.1.1: see README "Connecting probes". */
export const TOPIC_PREFIX = 'ferrisight/v1';
export const MAX_PAYLOAD_BYTES = 256 * 1024;
export const MAX_BATCH_READINGS = 1000;
/** Clock skew allowed for device timestamps ahead of the server. */
export const MAX_FUTURE_SKEW_MS = 60_000;

export const tagSchema = z.string().regex(/^[A-Za-z0-9][A-Za-z0-9_.-]{0,39}$/, 'tag: 1–40 letters, digits, _ . -');

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

const itemCount = `readings must hold 1–${MAX_BATCH_READINGS} items`;
const countError = (iss: { input?: unknown }) => `${itemCount} (got ${Array.isArray(iss.input) ? iss.input.length : '?'})`;

/**
 * Messages here are what dead letters say: issues under readings[i] refuse that element only,
 * anything else refuses the whole batch.
 */
export const batchMessageSchema = z.strictObject(
  {
    readings: z
      .array(batchReadingSchema, { error: 'readings must be an array' })
      .min(1, { error: countError })
      .max(MAX_BATCH_READINGS, { error: countError }),
  },
  {
    error: (iss) => (iss.code === 'unrecognized_keys' ? `unrecognized keys ${iss.keys.join(', ')}` : 'readings must be an array'),
  },
);
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
/** Every device topic of one site (a subscription filter). */
export const siteTopicFilter = (siteTag: string) => `${TOPIC_PREFIX}/${siteTag}/#`;
/** Every device topic (a subscription filter). */
export const ALL_DEVICES_FILTER = `${TOPIC_PREFIX}/#`;

/*
 * A reading has one type per stage, each derived from a schema here:
 * decoded (passed the device contract) → converted (matched to a probe, Nernst applied,
 * ready to store) → live (what screens and the alarm engine get).
 */
const idSchema = z.number().int().positive();
const flagSchema = z.enum(READING_FLAGS);

/** A reading that passed the device contract, not yet matched to a probe. */
export const decodedReadingSchema = readingFieldsSchema.extend({
  siteTag: tagSchema,
  probeTag: tagSchema,
  /** Position in a batch message; null for a single-reading message. */
  index: z.number().int().min(0).nullable(),
});
export type DecodedReading = z.infer<typeof decodedReadingSchema>;

/** A converted reading as pushed to screens and to the alarm engine. */
export const tankLiveSchema = z.object({
  tankId: idSchema,
  probeId: idSchema,
  probeTag: tagSchema,
  ts: isoTimestampSchema,
  orpMv: z.number().finite(),
  tempC: z.number().finite(),
  ehV: z.number().finite(),
  ratio: z.number().finite(),
  ferricFraction: z.number().finite(),
  flag: flagSchema,
  calibrationVersion: z.number().int().min(0),
});
export type TankLive = z.infer<typeof tankLiveSchema>;

/** A converted reading ready to store: the live fields with epoch times, its site and sequence. */
export const convertedReadingSchema = tankLiveSchema.omit({ ts: true }).extend({
  siteTag: tagSchema,
  tsMs: z.number().int(),
  seq: z.number().int().min(0).nullable(),
  receivedAtMs: z.number().int(),
});
export type ConvertedReading = z.infer<typeof convertedReadingSchema>;
