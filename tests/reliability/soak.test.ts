/**
 * Long form only (npm run soak, or FERRISIGHT_LONG=1): 2,000 readings/s
 * (200 msg/s × 10) for SOAK_MINUTES (default 30) through the real broker and worker → nothing
 * lost or duplicated, p99 publish → commit ≤ 1 s, RSS growth of broker and worker ≤ 10 % (from
 * the 10 % mark, after warm-up, to the end). Commit → dashboard is measured by bench:ingest (c).
 */
import mqtt from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { latestTopic } from '../../shared/schemas/internal-topics.ts';
import { quantile } from '../../bench/lib/bench-db.ts';
import type { TestDatabase } from '../helpers/test-db.ts';
import { compareStored, formatComparison, waitForCount } from './lib/compare.ts';
import { SERVICE_PASSWORD, rssMiB } from './lib/procs.ts';
import { drive, startLiveRig, stopLiveRig, type Rig } from './lib/rig.ts';

const LONG = process.env.FERRISIGHT_LONG === '1';
const MINUTES = Number(process.env.SOAK_MINUTES ?? 30);
// 200 probes at 10 Hz with real-time timestamps: a 1-minute rollup holds 600 readings per probe, as
// on a plant, not the tens of thousands a time-compressed stream would pile into one bucket.
const PROBES = 200;
const RATE = 2_000;
let db: TestDatabase;
let rig: Rig;

describe.skipIf(!LONG)('soak', () => {
  beforeAll(async () => {
    ({ db, rig } = await startLiveRig(PROBES));
  });
  afterAll(() => stopLiveRig({ db, rig }));

  it(`when 2,000 readings/s flow for ${MINUTES} min, then nothing is lost, p99 publish→commit ≤ 1 s and RSS grows ≤ 10 %`, async () => {
    const durationMs = MINUTES * 60_000;
    const stream = rig.stream(0, 1000 / (RATE / PROBES));
    const device = await rig.device('relia-dev-soak', { clean: false });
    // Publish time per (probe, ts), read back when the worker announces the commit on the live topic.
    const sentAt = new Map<string, number>();
    const commitMs: number[] = [];
    const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${rig.mqttPort}`, { username: 'ferrisight-service', password: SERVICE_PASSWORD, clientId: 'ferrisight-soak', protocolVersion: 4, reconnectPeriod: 1_000 });
    sub.on('message', (_t, buf) => {
      const now = Date.now();
      for (const r of JSON.parse(buf.toString()).readings as { probeTag: string; ts: string }[]) {
        const k = `${r.probeTag}|${Date.parse(r.ts)}`;
        const t = sentAt.get(k);
        if (t !== undefined) { commitMs.push(now - t); sentAt.delete(k); }
      }
      if (sentAt.size > 50_000) sentAt.clear(); // readings superseded within a flush never come back; keep memory flat
    });
    await sub.subscribeAsync(latestTopic(rig.siteTag), { qos: 0 });
    const rss: Array<{ atMs: number; broker: number; worker: number }> = [];
    let lastSample = 0;
    const run = await drive(device, stream, {
      readingsPerS: RATE, batch: 10, durationMs,
      during: (elapsed) => {
        if (elapsed - lastSample >= 10_000) {
          lastSample = elapsed;
          rss.push({ atMs: elapsed, broker: rssMiB(rig.broker!.pid)?.rss ?? NaN, worker: rssMiB(rig.worker!.pid)?.rss ?? NaN });
          if (elapsed > 0 && Math.round(elapsed / 60_000) !== Math.round((elapsed - 10_000) / 60_000)) {
            process.stdout.write(`soak ${Math.round(elapsed / 60_000)}/${MINUTES} min: sent ${stream.sent.count}, p99 commit ${commitMs.length ? quantile(commitMs, 0.99) : '-'} ms\n`);
          }
        }
      },
      onSend: (m) => { for (const r of m.readings.slice(-20)) sentAt.set(`${r.probe}|${Date.parse(r.ts)}`, Date.now()); },
    });
    await run.acked;
    await waitForCount(rig.pool, stream.sent.snapshot(), 120_000);
    const c = await compareStored(rig.pool, stream.sent.snapshot());
    await sub.endAsync();
    const base = rss.find((s) => s.atMs >= durationMs * 0.1) ?? rss[0];
    const end = rss[rss.length - 1];
    const growth = (k: 'broker' | 'worker') => (end[k] - base[k]) / base[k];
    const p99 = quantile(commitMs, 0.99);
    console.log(formatComparison(`soak ${MINUTES} min`, c));
    console.log(`publish→commit p50 ${quantile(commitMs, 0.5)} ms, p99 ${p99} ms (n=${commitMs.length}); RSS broker ${base.broker.toFixed(0)}→${end.broker.toFixed(0)} MiB `
      + `(${(100 * growth('broker')).toFixed(1)} %), worker ${base.worker.toFixed(0)}→${end.worker.toFixed(0)} MiB (${(100 * growth('worker')).toFixed(1)} %)`);
    expect(c.ok).toBe(true);
    expect(p99).toBeLessThanOrEqual(1_000);
    expect(growth('broker')).toBeLessThanOrEqual(0.1);
    expect(growth('worker')).toBeLessThanOrEqual(0.1);
  }, MINUTES * 60_000 + 300_000);
});
