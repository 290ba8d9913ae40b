import mqtt, { type MqttClient } from 'mqtt';
import { batchTopic, readingTopic } from '../../shared/schemas/readings.ts';

export type LoadOptions = {
  mqttUrl: string;
  username: string;
  password: string;
  siteTag: string;
  /** Synthetic probes L0001…: one per tank. */
  tanks: number;
  /** Readings per probe per second. */
  hz: number;
  /** Readings per message: 1 → per-probe `reading` messages, > 1 → `batch` messages. */
  batch: number;
  connections?: number;
  durationS: number;
  /** First seq of every probe (default: from the clock, so reruns never reuse one). */
  seqStart?: number;
  onProgress?: (sent: LoadResult) => void;
};

export type LoadResult = {
  sentMessages: number;
  sentReadings: number;
  /** Messages the broker PUBACKed. */
  ackedMessages: number;
  seqStart: number;
  /** Last seq per probe tag; readings per probe = lastSeq − seqStart + 1. */
  lastSeq: Record<string, number>;
  elapsedS: number;
};

export const loadProbeTag = (i: number) => `L${String(i + 1).padStart(4, '0')}`;

type Reading = { probe: string; ts: string; orpMv: number; tempC: number; seq: number };

/**
 * Benchmark load: every probe reads at `hz`, ts on an exact schedule (start + k/hz) so each
 * (probe, ts) is unique, messages spread round-robin over `connections` clients, all QoS 1.
 * Resolves when every message is PUBACKed by the broker (or rejects on a connection error).
 */
export async function runLoad(o: LoadOptions): Promise<LoadResult> {
  const nConn = Math.max(1, o.connections ?? 1);
  const clients: MqttClient[] = await Promise.all(Array.from({ length: nConn }, (_, i) => mqtt.connectAsync(o.mqttUrl, {
    username: o.username, password: o.password, clientId: `sim-load-${process.pid}-${i}`,
    protocolVersion: 4, clean: true, reconnectPeriod: 0,
  })));
  const periodMs = 1000 / o.hz;
  const seqStart = o.seqStart ?? Math.floor(Date.now() / periodMs);
  const tags = Array.from({ length: o.tanks }, (_, i) => loadProbeTag(i));
  const result: LoadResult = { sentMessages: 0, sentReadings: 0, ackedMessages: 0, seqStart, lastSeq: {}, elapsedS: 0 };
  const startMs = Date.now();
  const steps = Math.floor(o.durationS * o.hz);
  const pending: Promise<unknown>[] = [];
  let next = 0;
  let buffer: Reading[] = [];
  const send = (payload: string, topic: string, readings: number) => {
    const client = clients[next++ % nConn];
    result.sentMessages += 1;
    result.sentReadings += readings;
    pending.push(client.publishAsync(topic, payload, { qos: 1 }).then(() => { result.ackedMessages += 1; }));
  };
  for (let k = 0; k < steps; k += 1) {
    const dueMs = startMs + k * periodMs;
    const wait = dueMs - Date.now();
    if (wait > 0) await new Promise((r) => setTimeout(r, wait));
    const ts = new Date(dueMs).toISOString();
    const seq = seqStart + k;
    for (const [i, probe] of tags.entries()) {
      const reading = { probe, ts, orpMv: 380 + ((seq + i) % 40), tempC: 42, seq };
      result.lastSeq[probe] = seq;
      if (o.batch <= 1) {
        const { probe: _p, ...body } = reading;
        send(JSON.stringify(body), readingTopic(o.siteTag, probe), 1);
      } else {
        buffer.push(reading);
        if (buffer.length >= o.batch) {
          send(JSON.stringify({ readings: buffer }), batchTopic(o.siteTag), buffer.length);
          buffer = [];
        }
      }
    }
    if (k % Math.max(1, Math.round(o.hz)) === 0) o.onProgress?.({ ...result, elapsedS: (Date.now() - startMs) / 1000 });
  }
  if (buffer.length > 0) send(JSON.stringify({ readings: buffer }), batchTopic(o.siteTag), buffer.length);
  try {
    await Promise.all(pending);
  } finally {
    await Promise.all(clients.map((c) => c.endAsync()));
  }
  result.elapsedS = (Date.now() - startMs) / 1000;
  return result;
}
