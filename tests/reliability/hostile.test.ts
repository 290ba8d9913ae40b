/**
 * 10,000 generated hostile payloads (lib/hostile.ts) beside a valid
 * 2,000 readings/s stream → 0 crashes, every one dead-lettered with a reason, the valid stream
 * intact, and valid latency (publish → commit → live topic) measured quiet and under attack.
 * Short form asserts the counts and prints the latencies; FERRISIGHT_LONG=1 also asserts
 * p99 under attack ≤ 1.2 × quiet p99. Single readings that break the device contract are
 * dead-lettered by the embedded broker itself (ingest/broker/edge-screen.ts), the rest (batches,
 * unknown probes, skewed clocks) by the worker; either way each is one dead letter. Payloads over
 * the broker's 256 KB cap are refused outright (connection closed), checked separately.
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { MAX_PAYLOAD_BYTES, readingTopic } from '../../shared/schemas/readings.ts';
import { latestTopic } from '../../shared/schemas/internal-topics.ts';
import type { TestDatabase } from '../helpers/test-db.ts';
import { quantile } from '../../bench/lib/bench-db.ts';
import { compareStored, deadLetterSummary, formatComparison, waitForCount } from './lib/compare.ts';
import { hostilePayloads } from './lib/hostile.ts';
import { SERVICE_PASSWORD, sleep } from './lib/procs.ts';
import { drive, startLiveRig, stopLiveRig, type Rig } from './lib/rig.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const COUNT = 10_000;
const SEED = Number(process.env.FUZZ_SEED ?? 20261201);
let db: TestDatabase;
let rig: Rig;

beforeAll(async () => {
  ({ db, rig } = await startLiveRig(20));
});
afterAll(() => stopLiveRig({ db, rig }));

/** Single readings of RWARM every 50 ms; latency = its arrival on the live topic (published after commit) − publish time. */
async function measureLatency(durationMs: number): Promise<number[]> {
  const dev = await rig.device(`relia-lat-${Date.now()}`);
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${rig.mqttPort}`, {
    username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: `ferrisight-lat-${Date.now()}`, protocolVersion: 4, reconnectPeriod: 0,
  });
  const sentAt = new Map<string, number>();
  const out: number[] = [];
  sub.on('message', (_t, buf) => {
    const now = performance.now();
    for (const r of JSON.parse(buf.toString()).readings as { probeTag: string; ts: string }[]) {
      const t = r.probeTag === 'RWARM' ? sentAt.get(r.ts) : undefined;
      if (t !== undefined) out.push(now - t);
    }
  });
  await sub.subscribeAsync(latestTopic(rig.siteTag), { qos: 0 });
  const end = Date.now() + durationMs;
  for (let seq = 1; Date.now() < end; seq += 1) {
    const ts = new Date().toISOString();
    sentAt.set(ts, performance.now());
    dev.publish(readingTopic(rig.siteTag, 'RWARM'), JSON.stringify({ ts, orpMv: 410, tempC: 40, seq: 10_000_000 + seq }), { qos: 1 });
    await sleep(50);
  }
  await sleep(1_000);
  await Promise.all([sub.endAsync(), dev.endAsync()]);
  return out;
}

const fmt = (xs: number[]) => `n=${xs.length} p50 ${quantile(xs, 0.5).toFixed(1)} ms, p99 ${quantile(xs, 0.99).toFixed(1)} ms`;

describe('hostile payloads', () => {
  it(`when ${COUNT} hostile payloads arrive beside a valid stream, then none crashes anything, each is dead-lettered with a reason and the valid stream is intact`, async () => {
    const brokerPid = rig.broker!.pid;
    const workerPid = rig.worker!.pid;
    const payloads = hostilePayloads(rig.siteTag, rig.probes[0].tag, COUNT, SEED);
    // The same message again is kept once (dead letters carry a unique fingerprint), so expect one row per distinct message.
    const distinct = new Set(payloads.map((h) => `${h.topic}\0${Buffer.from(h.payload).toString('hex')}`)).size;
    const phaseMs = LONG ? 30_000 : 10_000;

    const quietStream = rig.stream();
    const quietDev = await rig.device('relia-dev-quiet', { clean: false });
    const [quietRun, quiet] = await Promise.all([
      drive(quietDev, quietStream, { readingsPerS: 2_000, batch: 10, durationMs: phaseMs }),
      measureLatency(phaseMs),
    ]);
    await quietRun.acked;

    const attackStream = rig.stream(1_000_000);
    const attacker = await rig.device('relia-dev-attack', { clean: false });
    const attack = (async () => {
      const perTick = Math.ceil(COUNT / (phaseMs / 50));
      for (let i = 0; i < payloads.length; i += perTick) {
        await Promise.all(payloads.slice(i, i + perTick).map((h) => attacker.publishAsync(h.topic, h.payload, { qos: 1 })));
        await sleep(50);
      }
    })();
    const [attackRun, loud] = await Promise.all([
      drive(quietDev, attackStream, { readingsPerS: 2_000, batch: 10, durationMs: phaseMs }),
      measureLatency(phaseMs),
      attack,
    ]);
    await attackRun.acked;

    await waitForCount(rig.pool, attackStream.sent.snapshot(), 30_000);
    const deadline = Date.now() + 30_000;
    let dl = await deadLetterSummary(rig.pool);
    while (dl.total < distinct && Date.now() < deadline) {
      await sleep(200);
      dl = await deadLetterSummary(rig.pool);
    }
    const [{ blank }] = await rig.pool.query("SELECT COUNT(*) AS blank FROM dead_letters WHERE reason IS NULL OR reason = ''");
    const kinds = payloads.reduce<Record<string, number>>((a, h) => ({ ...a, [h.kind]: (a[h.kind] ?? 0) + 1 }), {});
    const c1 = await compareStored(rig.pool, quietStream.sent.snapshot());
    const c2 = await compareStored(rig.pool, attackStream.sent.snapshot());
    console.log(`seed ${SEED}: ${COUNT} hostile payloads (${distinct} distinct) ${JSON.stringify(kinds)}; dead letters ${dl.total}; reasons ${JSON.stringify(dl.reasons)}`);
    console.log(formatComparison('valid stream, quiet', c1));
    console.log(formatComparison('valid stream, under attack', c2));
    console.log(`valid latency publish→commit→live: quiet ${fmt(quiet)}; under attack ${fmt(loud)}; p99 ratio ${(quantile(loud, 0.99) / quantile(quiet, 0.99)).toFixed(2)}`);

    expect(rig.broker!.pid).toBe(brokerPid);
    expect(rig.worker!.pid).toBe(workerPid);
    expect(rig.broker!.proc.exitCode ?? rig.broker!.proc.signalCode).toBeNull();
    expect(rig.worker!.proc.exitCode ?? rig.worker!.proc.signalCode).toBeNull();
    expect(dl.total).toBe(distinct);
    expect(Number(blank)).toBe(0);
    expect(c1.ok && c2.ok).toBe(true);
    // Samples: only the newest RWARM reading of each flush is announced, and flushes slow down under attack.
    expect(quiet.length).toBeGreaterThanOrEqual(5);
    expect(loud.length).toBeGreaterThanOrEqual(5);
    if (LONG) expect(quantile(loud, 0.99)).toBeLessThanOrEqual(1.2 * quantile(quiet, 0.99));
  }, 180_000);

  it('when a payload exceeds the 256 KB cap, then the broker dead-letters it, acknowledges it and keeps the connection; nothing reaches the worker', async () => {
    const before = (await deadLetterSummary(rig.pool)).total;
    const dev = await rig.device('relia-dev-huge', { reconnectPeriod: 0 });
    let closed = false;
    dev.once('close', () => { closed = true; });
    await dev.publishAsync(readingTopic(rig.siteTag, rig.probes[0].tag), Buffer.alloc(MAX_PAYLOAD_BYTES + 1, 0x41), { qos: 1 });
    await sleep(500);
    const [{ n }] = await rig.pool.query("SELECT COUNT(*) AS n FROM dead_letters WHERE reason_kind = 'too-large' AND payload_bytes = ?", [MAX_PAYLOAD_BYTES + 1]);
    expect({ closed, added: (await deadLetterSummary(rig.pool)).total - before, tooLarge: Number(n) }).toEqual({ closed: false, added: 1, tooLarge: 1 });
    await dev.endAsync(true);
    expect(rig.broker!.proc.exitCode).toBeNull();
  }, 20_000);
});
