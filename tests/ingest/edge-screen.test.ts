import pino from 'pino';
import { describe, expect, it } from 'vitest';
import { EdgeDeadLetters, screenMessage } from '../../ingest/broker/edge-screen.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { batchTopic, readingTopic } from '../../shared/schemas/readings.ts';
import { SERVICE_PASSWORD, addDevice, connect, seedPlant, useBrokerRig, waitFor } from './support.ts';

const good = (seq: number) => JSON.stringify({ ts: new Date().toISOString(), orpMv: 412.5, tempC: 38, seq });

describe('edge screening: which device messages the broker refuses itself', () => {
  const topic = readingTopic('kestrel', 'P1');

  it('when a single reading breaks the device contract, then it becomes one dead letter with the decoder\'s reason', () => {
    expect(screenMessage(topic, Buffer.from('{"ts": '), 5)?.reason).toMatch(/^invalid JSON/);
    expect(screenMessage(topic, Buffer.from(JSON.stringify({ ts: '2026-12-01T00:00:00Z', orpMv: '400', tempC: 30, seq: 1 })), 5)?.reason)
      .toMatch(/^invalid reading: orpMv: /);
    expect(screenMessage('ferrisight/v1/kestrel/P1/oops', Buffer.from(good(1)), 5)?.reason).toMatch(/^unknown topic/);
    const notUtf8 = screenMessage(topic, Buffer.from([0x7b, 0xff, 0x7d]), 7);
    expect(notUtf8).toEqual({ topic, payload: Buffer.from([0x7b, 0xff, 0x7d]), reason: 'payload is not UTF-8', receivedAtMs: 7 });
  });

  it('when a message needs the plant or holds a batch, then it goes on to the worker', () => {
    expect(screenMessage(topic, Buffer.from(good(1)), 5)).toBeNull();
    // Unknown probe, skewed clock: only the worker knows the plant and the retention window.
    expect(screenMessage(readingTopic('kestrel', 'NOPE'), Buffer.from(JSON.stringify({ ts: '2001-01-01T00:00:00Z', orpMv: 1, tempC: 1, seq: 1 })), 5)).toBeNull();
    // A batch's bad elements are refused one by one by the worker, the rest stored.
    expect(screenMessage(batchTopic('kestrel'), Buffer.from('{"readings": 5}'), 5)).toBeNull();
  });

  it('when the database cannot take the dead letters, then each waiting message is handed on (done(false)), none dropped', async () => {
    const down = { getConnection: () => Promise.reject(new Error('connect ECONNREFUSED')) } as unknown as Pool;
    const edge = new EdgeDeadLetters(down, pino({ level: 'silent' }), 1);
    const letter = screenMessage(topic, Buffer.from('nope'), 5)!;
    const outcomes = await Promise.all([1, 2, 3].map(() => new Promise<boolean>((resolve) => edge.add(letter, resolve))));
    expect(outcomes).toEqual([false, false, false]);
    expect(edge.stored).toBe(0);
  });
});

describe('edge screening in the embedded broker', () => {
  const rig = useBrokerRig(async (pool) => {
    await seedPlant(pool, 'kestrel', [{ tag: 'P1' }]);
    await addDevice(pool, 'kestrel', 'dev-edge', 'device-password-1');
  });

  it('when a device sends a broken reading at QoS 1, then its dead letter is committed before the PUBACK and the worker\'s session never holds it', async () => {
    // A persistent subscriber, as the ingest worker is: what reaches it is what its session stores.
    const sub = await connect(rig.broker.port, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-edge-sub', clean: false });
    const received: string[] = [];
    sub.on('message', (t, p) => received.push(`${t} ${p.toString()}`));
    await sub.subscribeAsync('ferrisight/v1/#', { qos: 1 });
    const device = await connect(rig.broker.port, { username: 'dev-edge', password: 'device-password-1', clientId: 'dev-edge-1' });
    const topic = readingTopic('kestrel', 'P1');

    await device.publishAsync(topic, '{"ts": 1', { qos: 1 });
    // publishAsync resolves on the PUBACK: the row must already be there.
    const rows = await rig.pool.query('SELECT topic, payload, reason FROM dead_letters');
    expect(rows).toEqual([{ topic, payload: '{"ts": 1', reason: expect.stringMatching(/^invalid JSON/) }]);

    await device.publishAsync(topic, good(2), { qos: 1 });
    await waitFor(async () => received.length >= 1);
    await new Promise((r) => setTimeout(r, 200));
    expect(received).toHaveLength(1);
    expect(received[0].startsWith(`${topic} {`)).toBe(true);
    expect(received[0]).toContain('"seq":2');
    await Promise.all([device.endAsync(), sub.endAsync()]);
  });
});
