import { z } from 'zod';
import {
  MAX_PAYLOAD_BYTES, batchMessageSchema, batchReadingSchema, parseTopic, readingMessageSchema, type DecodedReading,
} from '../../../../shared/schemas/readings.ts';
import { describeIssues } from '../../../../shared/schemas/issues.ts';

export type { DecodedReading };

/** Why (part of) a message was refused; `payload` is what gets dead-lettered. */
export type Rejection = { reason: string; payload: Buffer };

export type Decoded = { readings: DecodedReading[]; rejections: Rejection[] };

const utf8 = new TextDecoder('utf-8', { fatal: true });

export { describeIssues };

/** A batch whose envelope passed batchMessageSchema, elements not yet judged. */
const batchEnvelopeSchema = z.object({ readings: z.array(z.unknown()) });

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

/**
 * A batch through batchMessageSchema. Issues inside readings[i] refuse that element alone (its
 * reason carries the index and the element is dead-lettered by itself); any other issue refuses
 * the whole message.
 */
function decodeBatch(siteTag: string, json: unknown, payload: Buffer): Decoded {
  const parsed = batchMessageSchema.safeParse(json);
  // Fields copied by name: object rest/spread here cost more than the whole schema check.
  if (parsed.success) {
    return { readings: parsed.data.readings.map((d, index) => ({ siteTag, probeTag: d.probe, ts: d.ts, orpMv: d.orpMv, tempC: d.tempC, seq: d.seq, index })), rejections: [] };
  }
  const envelope = parsed.error.issues.filter((i) => i.path[0] !== 'readings' || typeof i.path[1] !== 'number');
  if (envelope.length > 0) return { readings: [], rejections: [{ reason: `invalid batch: ${envelope.map((i) => i.message).join('; ')}`, payload }] };
  // Only elements are wrong: judge each on its own so the good ones go on.
  const out: Decoded = { readings: [], rejections: [] };
  batchEnvelopeSchema.parse(json).readings.forEach((item, index) => {
    const one = batchReadingSchema.safeParse(item);
    if (one.success) {
      const d = one.data;
      out.readings.push({ siteTag, probeTag: d.probe, ts: d.ts, orpMv: d.orpMv, tempC: d.tempC, seq: d.seq, index });
    } else {
      const body = Buffer.from(JSON.stringify(item) ?? 'undefined', 'utf8');
      out.rejections.push({ reason: `readings[${index}]: ${describeIssues(one.error)}`, payload: body });
    }
  });
  return out;
}
