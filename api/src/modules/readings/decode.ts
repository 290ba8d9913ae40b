import type { z } from 'zod';
import {
  MAX_BATCH_READINGS, MAX_PAYLOAD_BYTES, batchReadingSchema, parseTopic, readingMessageSchema,
} from '../../../../shared/schemas/readings.ts';

/** A reading that passed the device contract, not yet matched to a probe. */
export type DecodedReading = {
  siteTag: string;
  probeTag: string;
  ts: string;
  orpMv: number;
  tempC: number;
  seq: number;
  /** Position in a batch message; null for a single-reading message. */
  index: number | null;
};

/** Why (part of) a message was refused; `payload` is what gets dead-lettered. */
export type Rejection = { reason: string; payload: Buffer };

export type Decoded = { readings: DecodedReading[]; rejections: Rejection[] };

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** Compact zod issues as "path: message; path: message". */
export function describeIssues(error: z.ZodError, prefix = ''): string {
  return error.issues
    .map((i) => `${[prefix, ...i.path.map(String)].filter(Boolean).join('.') || '(root)'}: ${i.message}`)
    .join('; ');
}

/**
 * Bytes + topic → readings that satisfy the contract in shared/schemas/readings.ts.
 * Never throws: whatever cannot be read becomes a rejection. In a batch, each bad
 * element is rejected on its own (reason carries its index) and the rest go on.
 */
export function decodeMessage(topic: string, payload: Buffer): Decoded {
  const reject = (reason: string, body = payload): Decoded => ({ readings: [], rejections: [{ reason, payload: body }] });
  if (payload.length > MAX_PAYLOAD_BYTES) return reject(`payload too large: ${payload.length} bytes > ${MAX_PAYLOAD_BYTES}`);
  const parsedTopic = parseTopic(topic);
  if (!parsedTopic) return reject(`unknown topic: expected ferrisight/v1/<site>/<probe>/reading or ferrisight/v1/<site>/batch`);
  let text: string;
  try {
    text = utf8.decode(payload);
  } catch {
    return reject('payload is not UTF-8');
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    return reject(`invalid JSON: ${(err as Error).message}`);
  }
  const { siteTag } = parsedTopic;
  if (parsedTopic.kind === 'reading') {
    const one = readingMessageSchema.safeParse(json);
    if (!one.success) return reject(`invalid reading: ${describeIssues(one.error)}`);
    const d = one.data;
    return { readings: [{ siteTag, probeTag: parsedTopic.probeTag, ts: d.ts, orpMv: d.orpMv, tempC: d.tempC, seq: d.seq, index: null }], rejections: [] };
  }
  return decodeBatch(siteTag, json, payload);
}

function decodeBatch(siteTag: string, json: unknown, payload: Buffer): Decoded {
  const envelope = json as { readings?: unknown } | null;
  const extraKeys = envelope && typeof envelope === 'object' && !Array.isArray(envelope)
    ? Object.keys(envelope).filter((k) => k !== 'readings') : [];
  const list = envelope && typeof envelope === 'object' ? envelope.readings : undefined;
  if (!Array.isArray(list) || extraKeys.length > 0) {
    const why = extraKeys.length > 0 ? `unrecognized keys ${extraKeys.join(', ')}` : 'readings must be an array';
    return { readings: [], rejections: [{ reason: `invalid batch: ${why}`, payload }] };
  }
  if (list.length < 1 || list.length > MAX_BATCH_READINGS) {
    const reason = `invalid batch: readings must hold 1–${MAX_BATCH_READINGS} items (got ${list.length})`;
    return { readings: [], rejections: [{ reason, payload }] };
  }
  const out: Decoded = { readings: [], rejections: [] };
  list.forEach((item, index) => {
    const one = batchReadingSchema.safeParse(item);
    if (one.success) {
      // Fields copied by name: object rest/spread here cost more than the whole schema check.
      const d = one.data;
      out.readings.push({ siteTag, probeTag: d.probe, ts: d.ts, orpMv: d.orpMv, tempC: d.tempC, seq: d.seq, index });
    } else {
      const body = Buffer.from(JSON.stringify(item) ?? 'undefined', 'utf8');
      out.rejections.push({ reason: `readings[${index}]: ${describeIssues(one.error)}`, payload: body });
    }
  });
  return out;
}
