import pino from 'pino';
import { describe, expect, it } from 'vitest';
import { decodeMessage } from '../../api/src/modules/readings/decode.ts';
import { Flusher, type QueueItem, type StoreFlush } from '../../ingest/flusher.ts';
import { IngestMetrics } from '../../ingest/metrics.ts';
import type { ConvertedReading } from '../../api/src/modules/readings/convert.ts';
import { buildLookup } from '../../api/src/modules/readings/probe-cache.ts';
import { readingTopic } from '../../shared/schemas/readings.ts';

/*
 * The flusher's ordering promise, without a database: transactions may commit out of order,
 * but PUBACKs (MQTT-4.6.0-2: in the order the PUBLISHes arrived) and onCommitted (the alarm
 * engine judges readings in time order) follow the order the batches were taken.
 */
const lookup = buildLookup([{
  probe_id: 1, probe_tag: 'P1', tank_id: 1, site_tag: 'kestrel', reference_id: 'agcl-sat',
  reference_e25_v: 0.199, reference_coeff_v_per_k: -0.001, version: 1, formal_potential_v: 0.675, formal_coeff_v_per_k: 0,
}], ['kestrel']);
const cache = Object.assign(lookup, { ensure: async () => undefined });
const log = pino({ level: 'silent' });
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function item(seq: number, acks: number[]): QueueItem {
  const topic = readingTopic('kestrel', 'P1');
  const payload = Buffer.from(JSON.stringify({ ts: new Date(Date.now() - 60_000 + seq).toISOString(), orpMv: 450, tempC: 40, seq }));
  return { topic, payload, receivedAtMs: Date.now(), decoded: decodeMessage(topic, payload), ack: () => acks.push(seq), isStale: () => false };
}

function flusher(store: StoreFlush, maxInFlight: number, committed: number[][]) {
  return new Flusher({
    pool: null as never, cache, metrics: new IngestMetrics(), log, retentionDays: 90, store,
    lingerMs: 0, maxReadings: 1, maxQueuedReadings: 100, maxInFlight,
    onCommitted: (inserted: ConvertedReading[]) => committed.push(inserted.map((r) => r.seq!)),
  });
}

const stored = (readings: ConvertedReading[]) => ({ stored: readings.length, duplicates: 0, conflicts: 0, inserted: readings });

describe('Flusher with transactions in flight at once', () => {
  it('when a later batch commits first, then PUBACKs and onCommitted still follow the arrival order', async () => {
    const acks: number[] = [];
    const committed: number[][] = [];
    const commitOrder: number[] = [];
    // Batch 1 is slow, 2 fast, 3 medium: the store finishes 2, 3, 1.
    const delays = new Map([[1, 120], [2, 10], [3, 40]]);
    const f = flusher(async (rs) => {
      await sleep(delays.get(rs[0].seq!) ?? 0);
      commitOrder.push(rs[0].seq!);
      return stored(rs);
    }, 3, committed);
    for (const seq of [1, 2, 3]) f.enqueue(item(seq, acks));
    await sleep(20);
    await f.stop();
    expect(commitOrder).toEqual([2, 3, 1]);
    expect(acks).toEqual([1, 2, 3]);
    expect(committed).toEqual([[1], [2], [3]]);
  });

  it('when the first batch fails and is retried, then nothing after it is acknowledged before it commits', async () => {
    const acks: number[] = [];
    const committed: number[][] = [];
    let failures = 0;
    const f = flusher(async (rs) => {
      if (rs[0].seq === 1 && failures < 2) {
        failures += 1;
        throw Object.assign(new Error('Deadlock found when trying to get lock'), { errno: 1213 });
      }
      return stored(rs);
    }, 2, committed);
    f.enqueue(item(1, acks));
    f.enqueue(item(2, acks));
    await sleep(30);
    expect(acks).toEqual([]); // 2 is committed but waits for 1
    for (let i = 0; i < 100 && acks.length < 2; i += 1) await sleep(20);
    await f.stop();
    expect(failures).toBe(2);
    expect(acks).toEqual([1, 2]);
    expect(committed).toEqual([[1], [2]]);
  });

  it('when maxInFlight is 2, then no more than 2 stores run at once', async () => {
    const acks: number[] = [];
    let running = 0;
    let peak = 0;
    const f = flusher(async (rs) => {
      running += 1;
      peak = Math.max(peak, running);
      await sleep(15);
      running -= 1;
      return stored(rs);
    }, 2, []);
    for (let seq = 1; seq <= 8; seq += 1) f.enqueue(item(seq, acks));
    for (let i = 0; i < 100 && acks.length < 8; i += 1) await sleep(10);
    await f.stop();
    expect(peak).toBe(2);
    expect(acks).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });
});
