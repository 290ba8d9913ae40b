/**
 * Hostile device payloads for hostile.test.ts, generated with fast-check. Every one is built to be refused
 * exactly once (one dead letter each), so "100 % dead-lettered" is a count, not a guess:
 * single-reading topics, or batch envelopes that fail as a whole.
 */
import fc from 'fast-check';
import { MAX_PAYLOAD_BYTES, batchTopic, readingTopic } from '../../../shared/schemas/readings.ts';

export type Hostile = { kind: string; topic: string; payload: Buffer };

const DAY = 86_400_000;

export function hostileArbitrary(site: string, knownProbe: string): fc.Arbitrary<Hostile> {
  const one = (kind: string, body: fc.Arbitrary<string | Buffer>, topic = readingTopic(site, knownProbe)) =>
    body.map((b) => ({ kind, topic, payload: Buffer.isBuffer(b) ? b : Buffer.from(b, 'utf8') }));
  const good = { ts: new Date().toISOString(), orpMv: 400, tempC: 40, seq: 1 };
  const withField = (field: keyof typeof good, value: fc.Arbitrary<unknown>) =>
    value.map((v) => JSON.stringify({ ...good, [field]: v }));

  return fc.oneof(
    one('invalid-json', fc.string({ maxLength: 200 }).map((s) => `{"ts":${s}`)),
    one('empty', fc.constant('')),
    one('wrong-type', fc.oneof(
      withField('ts', fc.oneof(fc.integer(), fc.boolean(), fc.constant(null), fc.string({ maxLength: 30 }))),
      withField('orpMv', fc.oneof(fc.string({ maxLength: 10 }), fc.boolean(), fc.array(fc.integer(), { maxLength: 3 }), fc.constant(null))),
      withField('seq', fc.oneof(fc.double({ min: 0.1, max: 0.9 }), fc.integer({ max: -1 }), fc.string())),
      fc.jsonValue().filter((v) => typeof v !== 'object' || v === null || Array.isArray(v)).map((v) => JSON.stringify(v)),
    )),
    // JSON has no NaN/Infinity: as bare words they are invalid JSON, as strings wrong types, 1e999 parses to Infinity.
    one('nan-infinity', fc.constantFrom(
      '{"ts":"2026-01-01T00:00:00Z","orpMv":NaN,"tempC":40,"seq":1}',
      `${JSON.stringify(good).slice(0, -1)},"orpMv":Infinity}`,
      JSON.stringify({ ...good, orpMv: 'NaN' }), JSON.stringify({ ...good, tempC: '-Infinity' }),
      JSON.stringify(good).replace('"orpMv":400', '"orpMv":1e999'),
    )),
    one('huge-number', fc.oneof(
      withField('orpMv', fc.oneof(fc.double({ min: 2001, max: 1e308, noNaN: true }), fc.double({ min: -1e308, max: -2001, noNaN: true }))),
      withField('seq', fc.constantFrom(2 ** 60, Number.MAX_VALUE)),
      withField('tempC', fc.double({ min: 151, max: 1e300, noNaN: true })),
    )),
    one('deep-nesting', fc.integer({ min: 1_000, max: 50_000 }).map((n) => `{"ts":${'['.repeat(n)}${']'.repeat(n)}}`)),
    one('oversized', fc.integer({ min: 64 * 1024, max: MAX_PAYLOAD_BYTES - 1024 }).map((n) => JSON.stringify({ ...good, pad: 'x'.repeat(n) }))),
    one('invalid-utf8', fc.uint8Array({ minLength: 1, maxLength: 300 }).map((a) => Buffer.concat([Buffer.from('{"ts":"'), Buffer.from(a), Buffer.from([0xc3, 0x28, 0xff])]))),
    fc.stringMatching(/^[A-Z][A-Z0-9]{3,10}$/).map((tag) => ({
      kind: 'unknown-probe', topic: readingTopic(site, `ZZ${tag}`), payload: Buffer.from(JSON.stringify(good)),
    })),
    // ≥ 10 min ahead: the skew is fixed at generation, and the payload may be published a minute later.
    one('skewed-clock', fc.oneof(fc.integer({ min: 600_000, max: 365 * DAY }), fc.integer({ min: -3650 * DAY, max: -91 * DAY }))
      .map((skew) => JSON.stringify({ ...good, ts: new Date(Date.now() + skew).toISOString() }))),
    one('bad-batch', fc.oneof(
      fc.constantFrom('{"readings":5}', '{"readings":[]}', '[]', '{"readings":{}}', '{"readings":[1],"extra":true}'),
      fc.constant(JSON.stringify({ readings: Array.from({ length: 1001 }, (_, i) => ({ probe: knownProbe, ts: good.ts, orpMv: 400, tempC: 40, seq: i })) })),
    ), batchTopic(site)),
    one('bad-topic', fc.constant(JSON.stringify(good)), `ferrisight/v1/${site}/${knownProbe}/reading/extra`),
  );
}

/** n hostile payloads, reproducible from the seed (printed by the test so a failure can be replayed). */
export function hostilePayloads(site: string, knownProbe: string, n: number, seed: number): Hostile[] {
  return fc.sample(hostileArbitrary(site, knownProbe), { numRuns: n, seed });
}
