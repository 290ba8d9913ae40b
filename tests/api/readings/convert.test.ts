import { describe, expect, it } from 'vitest';
import { renderPayload } from '../../../api/src/modules/readings/dead-letters.repository.ts';
import { processMessage } from '../../../api/src/modules/readings/convert.ts';
import { buildLookup } from '../../../api/src/modules/readings/probe-cache.ts';
import { MAX_PAYLOAD_BYTES, batchTopic, readingTopic } from '../../../shared/schemas/readings.ts';

const NOW = Date.UTC(2026, 11, 1, 8, 0, 0);
const lookup = buildLookup([{
  probe_id: 7, probe_tag: 'LIGHT', tank_id: 3, site_tag: 'kestrel', reference_id: 'agcl-sat',
  reference_e25_v: 0.199, reference_coeff_v_per_k: -0.001, version: 2, formal_potential_v: 0.675, formal_coeff_v_per_k: 0,
}], ['kestrel']);
const opts = { receivedAtMs: NOW, retentionDays: 90 };
const json = (v: unknown) => Buffer.from(JSON.stringify(v));

describe('processMessage (validate + convert, no I/O)', () => {
  it("when Light's solution reads +476 mV vs 0.199 V at 25 °C, then Eh is 0.675 V and the ratio 1.000", () => {
    // Source: Standard Methods 2580 / ASTM D1498 (Light's solution, 0.675 V vs SHE at 25 °C).
    const res = processMessage(readingTopic('kestrel', 'LIGHT'), json({ ts: new Date(NOW).toISOString(), orpMv: 476, tempC: 25, seq: 1 }), lookup, opts);
    expect(res.rejections).toEqual([]);
    expect(res.readings[0]).toMatchObject({ probeId: 7, tankId: 3, calibrationVersion: 2, flag: 'ok', seq: 1 });
    expect(res.readings[0].ehV).toBeCloseTo(0.675, 12);
    expect(res.readings[0].ratio).toBeCloseTo(1, 12);
  });

  it('when the payload is larger than MAX_PAYLOAD_BYTES, then it is rejected as too large', () => {
    const res = processMessage(batchTopic('kestrel'), Buffer.alloc(MAX_PAYLOAD_BYTES + 1, 0x20), lookup, opts);
    expect(res.rejections[0].reason).toBe(`payload too large: ${MAX_PAYLOAD_BYTES + 1} bytes > ${MAX_PAYLOAD_BYTES}`);
  });

  it('when a ts is 61 s ahead or just inside 60 s ahead, then only the first is refused', () => {
    const at = (ms: number) => ({ probe: 'LIGHT', ts: new Date(NOW + ms).toISOString(), orpMv: 400, tempC: 30, seq: ms });
    const res = processMessage(batchTopic('kestrel'), json({ readings: [at(61_000), at(59_000)] }), lookup, opts);
    expect(res.readings.map((r) => r.seq)).toEqual([59_000]);
    expect(res.rejections[0].reason).toMatch(/^readings\[0\]: ts .* more than 60 s in the future$/);
  });

  it('when a batch envelope is wrong, then the whole message is rejected once', () => {
    expect(processMessage(batchTopic('kestrel'), json({ readings: [] }), lookup, opts).rejections[0].reason).toMatch(/1–1000 items/);
    expect(processMessage(batchTopic('kestrel'), json([1, 2]), lookup, opts).rejections[0].reason).toMatch(/readings must be an array/);
    expect(processMessage(batchTopic('kestrel'), json({ readings: [], x: 1 }), lookup, opts).rejections[0].reason).toMatch(/unrecognized keys x/);
  });

  it('when a payload is long UTF-8 or binary, then the stored copy is cut to 4 KB without splitting a character', () => {
    const text = renderPayload(Buffer.from('é'.repeat(3000)));
    expect(Buffer.byteLength(text)).toBeLessThanOrEqual(4096);
    expect(text).toBe('é'.repeat(2048));
    expect(renderPayload(Buffer.alloc(10_000, 0xff))).toMatch(/^hex:(ff){2046}$/);
  });
});
