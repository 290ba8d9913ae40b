/**
 * The contracts between processes (shared/schemas): what each receiver accepts and refuses.
 * Sources: the device contract in README "Connecting probes"; topic and event shapes are this
 * project's own, so the checks are about refusing what does not fit rather than published values.
 */
import { describe, expect, it } from 'vitest';
import { toTankLive } from '../../ingest/live.ts';
import { cacheInvalidateSchema, latestMessageSchema, latestTopic, parseInternal } from '../../shared/schemas/internal-topics.ts';
import { batchMessageSchema, convertedReadingSchema, decodedReadingSchema, tankLiveSchema } from '../../shared/schemas/readings.ts';
import { simCommandSchema, simStateSchema } from '../../shared/schemas/simulator.ts';
import { alarmSinceSchema, serverEventSchemas, socketAuthSchema } from '../../shared/schemas/socket-events.ts';

const converted = {
  probeId: 7, tankId: 3, probeTag: 'A1-ORP', siteTag: 'kestrel', tsMs: Date.UTC(2026, 11, 1, 8), seq: 12,
  orpMv: 412.6, tempC: 42.1, ehV: 0.62, ratio: 0.35, ferricFraction: 0.26, flag: 'ok' as const,
  calibrationVersion: 2, receivedAtMs: Date.UTC(2026, 11, 1, 8, 0, 1),
};

describe('reading stages', () => {
  it('when a converted reading becomes a live one, then each stage fits its own schema', () => {
    expect(convertedReadingSchema.parse(converted)).toEqual(converted);
    const live = toTankLive(converted);
    expect(tankLiveSchema.parse(live)).toEqual(live);
    expect(live.ts).toBe('2026-12-01T08:00:00.000Z');
    expect(decodedReadingSchema.safeParse({ siteTag: 'kestrel', probeTag: 'A1-ORP', ts: live.ts, orpMv: 1, tempC: 2, seq: 3, index: null }).success).toBe(true);
  });

  it('when a live reading carries a non-finite ratio or an unknown flag, then it is refused', () => {
    const live = toTankLive(converted);
    expect(tankLiveSchema.safeParse({ ...live, ratio: Number.POSITIVE_INFINITY }).success).toBe(false);
    expect(tankLiveSchema.safeParse({ ...live, flag: 'maybe' }).success).toBe(false);
    expect(tankLiveSchema.safeParse({ ...live, ts: '2026-12-01 08:00' }).success).toBe(false);
  });

  it('when a batch holds 1 001 readings (README: up to 1,000), then the schema refuses it with the count', () => {
    const one = { probe: 'A1', ts: '2026-12-01T08:00:00Z', orpMv: 400, tempC: 40, seq: 1 };
    expect(batchMessageSchema.safeParse({ readings: Array(1000).fill(one) }).success).toBe(true);
    const r = batchMessageSchema.safeParse({ readings: Array(1001).fill(one) });
    expect(r.error?.issues.map((i) => i.message)).toEqual(['readings must hold 1–1000 items (got 1001)']);
  });
});

describe('internal topics', () => {
  it('when a latest-values message is well formed, then it parses to the live readings', () => {
    const live = toTankLive(converted);
    expect(parseInternal(latestMessageSchema, latestTopic('kestrel'), Buffer.from(JSON.stringify({ readings: [live] })))).toEqual({ readings: [live] });
  });

  it('when an internal payload does not fit, then the error names the topic and the field', () => {
    const topic = latestTopic('kestrel');
    expect(() => parseInternal(latestMessageSchema, topic, Buffer.from('{"readings":[{"tankId":"3"}]}'))).toThrow(/^ferrisight\/internal\/v1\/kestrel\/latest: readings\.0\.tankId: /);
    expect(() => parseInternal(latestMessageSchema, topic, '{"readings":')).toThrow(/invalid JSON/);
    expect(() => parseInternal(cacheInvalidateSchema, 'x', '{"all":true}')).toThrow(/Unrecognized key/);
  });
});

describe('simulator commands', () => {
  it('when a command leaves out the action, then it starts the fault; a padded probe tag is trimmed', () => {
    expect(simCommandSchema.parse({ fault: 'noisy', probeTag: ' A1-ORP ' })).toEqual({ fault: 'noisy', probeTag: 'A1-ORP', action: 'start' });
    expect(simCommandSchema.parse({ fault: 'clear', probeTag: 'A1-ORP', action: 'clear' }).fault).toBe('clear');
  });

  it('when a command names an unknown fault or a tag no device could publish, then it is refused', () => {
    expect(simCommandSchema.safeParse({ fault: 'fire', probeTag: 'A1-ORP' }).success).toBe(false);
    expect(simCommandSchema.safeParse({ fault: 'noisy', probeTag: 'A1/ORP' }).success).toBe(false);
    expect(simCommandSchema.safeParse({ fault: 'noisy', probeTag: '' }).success).toBe(false);
    // The state lists running faults only: 'clear' is a command, never a state.
    expect(simStateSchema.safeParse({ faults: [{ fault: 'clear', probeTag: 'A1', since: 'x' }], at: 'x' }).success).toBe(false);
  });
});

describe('socket.io events', () => {
  it('when a handshake carries junk, then it counts as no token and no resume id', () => {
    expect(socketAuthSchema.parse({ token: 5, lastAlarmEventId: 'abc' })).toEqual({});
    expect(socketAuthSchema.parse(null)).toEqual({});
    expect(socketAuthSchema.parse({ token: 't', lastAlarmEventId: '12' })).toEqual({ token: 't', lastAlarmEventId: 12 });
    expect(socketAuthSchema.parse({ lastAlarmEventId: -1 })).toEqual({});
  });

  it('when alarm:since or a server payload is out of contract, then it is refused', () => {
    expect(alarmSinceSchema.safeParse(3).success).toBe(true);
    expect(alarmSinceSchema.safeParse(-1).success).toBe(false);
    expect(alarmSinceSchema.safeParse(1.5).success).toBe(false);
    expect(serverEventSchemas['probe:freshness'].safeParse({ probeId: 1, tankId: 2, stale: true, lastTs: null }).success).toBe(true);
    expect(serverEventSchemas['probe:freshness'].safeParse({ probeId: 1, tankId: 2, stale: 'yes', lastTs: null }).success).toBe(false);
    expect(serverEventSchemas['alarm:resync'].safeParse({ lastEventId: '9' }).success).toBe(false);
  });
});
