/**
 * Stores the generated week exactly as a gateway's backlog would be stored: batch messages in
 * the device contract, decoded, checked and converted by the ingest pipeline (Nernst with the
 * probe's reference and the tank's calibration), then written by the ingest worker's own
 * idempotent store, which keeps the 1-minute and 1-hour rollups in step.
 */
import { createIngestPool, inTransaction } from '../../api/src/db/pool.ts';
import { decodeMessage } from '../../api/src/modules/readings/decode.ts';
import { convertReading, type ConvertedReading } from '../../api/src/modules/readings/convert.ts';
import { ProbeCache } from '../../api/src/modules/readings/probe-cache.ts';
import { storeReadings } from '../../api/src/modules/readings/readings.repository.ts';
import { batchTopic, MAX_BATCH_READINGS } from '../../shared/schemas/readings.ts';
import { HISTORY_RETENTION_DAYS } from './demo-story.ts';
import type { ProbeHistory } from './history-model.ts';

/** Readings per store transaction: a few batches, so a transaction stays short. */
const PER_TRANSACTION = 5000;
/** A gateway's typical delay between the reading and its arrival. */
const LATENCY_MS = 400;

/** The device's sequence number: the live simulator counts 5-s steps from the epoch, so history and live never collide. */
const seqOf = (tsMs: number) => Math.floor(tsMs / 5000);

function convertBatch(siteTag: string, probeTag: string, points: ProbeHistory['points'], cache: ProbeCache): ConvertedReading[] {
  const body = { readings: points.map((p) => ({ probe: probeTag, ts: new Date(p.tsMs).toISOString(), orpMv: p.orpMv, tempC: p.tempC, seq: seqOf(p.tsMs) })) };
  const decoded = decodeMessage(batchTopic(siteTag), Buffer.from(JSON.stringify(body)));
  if (decoded.rejections.length) throw new Error(`demo history refused: ${decoded.rejections[0].reason}`);
  return decoded.readings.map((r) => {
    const out = convertReading(r, cache, { receivedAtMs: Date.parse(r.ts) + LATENCY_MS, retentionDays: HISTORY_RETENTION_DAYS });
    if (typeof out === 'string') throw new Error(`demo history refused: ${out}`);
    return out;
  });
}

/**
 * @returns the converted readings per probe tag, in time order (the alarm replay reads them)
 */
export async function storeHistory(databaseUrl: string, siteTag: string, histories: ProbeHistory[]): Promise<Map<string, ConvertedReading[]>> {
  const pool = createIngestPool(databaseUrl, 2);
  const out = new Map<string, ConvertedReading[]>();
  try {
    const cache = new ProbeCache(pool);
    await cache.reload();
    let pending: ConvertedReading[] = [];
    const flush = async () => {
      const rows = pending;
      pending = [];
      const res = await inTransaction(pool, (conn) => storeReadings(conn, rows, 'seed:demo-history'));
      if (res.stored !== rows.length) throw new Error(`demo history: ${rows.length - res.stored} readings were not stored (existing data?)`);
    };
    for (const h of histories) {
      const converted: ConvertedReading[] = [];
      for (let i = 0; i < h.points.length; i += MAX_BATCH_READINGS) {
        converted.push(...convertBatch(siteTag, h.probe.probeTag, h.points.slice(i, i + MAX_BATCH_READINGS), cache));
      }
      out.set(h.probe.probeTag, converted);
      for (const r of converted) {
        pending.push(r);
        if (pending.length >= PER_TRANSACTION) await flush();
      }
    }
    if (pending.length) await flush();
    return out;
  } finally {
    await pool.end();
  }
}
