/**
 * The measurements behind `npm run bench:scale` (bench/scale.bench.ts): ingest throughput of
 * a cluster, and alarm latency to many socket.io clients spread over the API nodes.
 */
import { rmSync } from 'node:fs';
import path from 'node:path';
import mqtt, { type MqttClient } from 'mqtt';
import { createMigrator, createSequelize } from '../../api/src/db/sequelize.ts';
import { latestMessageSchema, latestTopic, parseInternal } from '../../shared/schemas/internal-topics.ts';
import { batchTopic, readingTopic } from '../../shared/schemas/readings.ts';
import { bootstrapTcpRoot, mariadbQuery, startMariadb, stopMariadb, type MariadbOptions } from '../../scripts/lib/mariadb.ts';
import { findFreePort } from '../../scripts/lib/ports.ts';
import type { Pool } from '../../api/src/db/pool.ts';
import { connectDevice, sleep, waitFor, type AlarmTank, type ScaleSite } from '../../tests/scale/lib/plant.ts';
import type { Watcher } from '../../tests/scale/lib/watchers.ts';
import { quantile } from './bench-db.ts';

/** A MariaDB of the benchmark's own (not .data/bench-mariadb, which other benchmarks wipe), one database per configuration. */
export async function benchServer(root: string): Promise<{ newDatabase(name: string): Promise<string>; stop(): Promise<void> }> {
  const baseDir = path.join(root, '.data', 'bench-scale-mariadb');
  await stopMariadb({ baseDir, port: 0 }).catch(() => undefined);
  rmSync(baseDir, { recursive: true, force: true });
  const opts: MariadbOptions = { baseDir, port: await findFreePort(), bufferPool: '512M', portSetting: 'BENCH_DB_PORT' };
  await startMariadb(opts);
  const { adminUrl } = await bootstrapTcpRoot(opts);
  return {
    async newDatabase(name) {
      await mariadbQuery(opts, `CREATE DATABASE ${name} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
      const url = `${adminUrl}${name}`;
      const seq = createSequelize(url, 2);
      await createMigrator(seq).up();
      await seq.close();
      return url;
    },
    async stop() {
      await stopMariadb(opts);
      rmSync(baseDir, { recursive: true, force: true });
    },
  };
}

async function storedCount(pool: Pool, sites: ScaleSite[]): Promise<number> {
  const ids = sites.flatMap((s) => s.probes.map((p) => p.id));
  const [row] = (await pool.query(`SELECT COUNT(*) AS n FROM readings WHERE probe_id IN (${ids.join(',')})`)) as { n: number }[];
  return Number(row!.n);
}

/**
 * Publishes `readings` readings over both sites as fast as the broker acknowledges them
 * (`batch` readings per message, 1 = one message per reading, as most devices send) and
 * returns readings/s from the first publish until the last one is stored. Reading k of a
 * probe is stamped originMs + k s: runs need origins far enough apart not to overlap.
 */
export async function ingestRate(pool: Pool, mqttPort: number, sites: ScaleSite[], readings: number, batch: number, seqBase: number, originMs: number): Promise<number> {
  const before = await storedCount(pool, sites);
  const clients: MqttClient[] = await Promise.all(sites.flatMap((s) => [0, 1].map((k) => connectDevice(mqttPort, s, `bench-${s.tag}-${k}-${seqBase}`))));
  const started = performance.now();
  const perSite = Math.floor(readings / sites.length);
  await Promise.all(sites.map(async (site, si) => {
    const pending: Promise<unknown>[] = [];
    for (let k = 0; k < perSite; k += batch) {
      const items = Array.from({ length: Math.min(batch, perSite - k) }, (_, j) => {
        const n = k + j;
        const probe = site.probes[n % site.probes.length]!;
        const k1 = Math.floor(n / site.probes.length);
        // One reading per probe per second, as a plant sends: rollup windows hold what they would hold on site.
        return { probe: probe.tag, ts: new Date(originMs + k1 * 1000).toISOString(), orpMv: 400 + (n % 50), tempC: 40, seq: seqBase + k1 };
      });
      const client = clients[si * 2 + ((k / batch) % 2)]!;
      const payload = batch === 1 ? JSON.stringify({ ts: items[0]!.ts, orpMv: items[0]!.orpMv, tempC: 40, seq: items[0]!.seq }) : JSON.stringify({ readings: items });
      pending.push(client.publishAsync(batch === 1 ? readingTopic(site.tag, items[0]!.probe) : batchTopic(site.tag), payload, { qos: 1 }));
      // At most ~2,000 messages in flight per site: a device fleet, not a flood of one socket.
      if (pending.length >= 2_000) await Promise.all(pending.splice(0));
    }
    await Promise.all(pending);
  }));
  await waitFor(async () => (await storedCount(pool, sites)) - before >= perSite * sites.length, 300_000);
  const seconds = (performance.now() - started) / 1000;
  await Promise.all(clients.map((c) => c.endAsync(true)));
  return (perSite * sites.length) / seconds;
}

export type Latency = { p50: number; p95: number; max: number; delivered: number };

/**
 * Raises one alarm per tank (a below-band reading through the broker), and measures, per
 * watcher, publish → `alarm:event` arrival. delivered = share of (alarm, watcher) pairs that arrived.
 */
export async function alarmLatency(pool: Pool, mqttPort: number, tanks: AlarmTank[], watchers: Watcher[]): Promise<Latency> {
  const sent = new Map<number, number>();
  const bySite = new Map<string, MqttClient>();
  for (const t of tanks) if (!bySite.has(t.site.tag)) bySite.set(t.site.tag, await connectDevice(mqttPort, t.site, `bench-alarm-${t.site.tag}-${t.definitionId}`));
  for (const t of tanks) {
    sent.set(t.definitionId, performance.now());
    await bySite.get(t.site.tag)!.publishAsync(readingTopic(t.site.tag, t.probeTag), JSON.stringify({ ts: new Date().toISOString(), orpMv: 420, tempC: 25, seq: Date.now() }), { qos: 1 });
    await sleep(50);
  }
  await Promise.all([...bySite.values()].map((c) => c.endAsync(true)));
  const defs = tanks.map((t) => t.definitionId).join(',');
  let events: { id: number; definition_id: number }[] = [];
  await waitFor(async () => {
    events = (await pool.query(`SELECT MIN(id) AS id, definition_id FROM alarm_events WHERE definition_id IN (${defs}) GROUP BY definition_id`)) as typeof events;
    return events.length === tanks.length;
  }, 60_000);
  await waitFor(() => watchers.every((w) => events.every((e) => w.alarms.has(e.id))), 20_000).catch(() => undefined);
  const lat: number[] = [];
  for (const e of events) for (const w of watchers) {
    const at = w.alarms.get(e.id);
    if (at !== undefined) lat.push(at - sent.get(e.definition_id)!);
  }
  return { p50: quantile(lat, 0.5), p95: quantile(lat, 0.95), max: Math.max(...lat), delivered: lat.length / (events.length * watchers.length) };
}

/**
 * publish → commit at a steady offered load: `readingsPerS` readings a second over the site's
 * probes, `batch` per message, for `seconds`; each reading is stamped with its publish time and
 * the commit time is when the worker's post-commit live message names it (latestTopic).
 * Returns p50 and p99 in ms.
 */
export async function commitLatency(mqttPort: number, site: ScaleSite, serviceAuth: { username: string; password: string },
  o: { readingsPerS: number; batch: number; seconds: number; seqBase: number }): Promise<{ p50: number; p99: number; n: number }> {
  const sub = await mqtt.connectAsync(`mqtt://127.0.0.1:${mqttPort}`, { ...serviceAuth, clientId: `ferrisight-lat-${o.seqBase}`, protocolVersion: 4, reconnectPeriod: 0 });
  const lat: number[] = [];
  sub.on('message', (topic, buf) => {
    const at = Date.now();
    for (const r of parseInternal(latestMessageSchema, topic, buf).readings) lat.push(at - Date.parse(r.ts));
  });
  await sub.subscribeAsync(latestTopic(site.tag), { qos: 0 });
  const device = await connectDevice(mqttPort, site, `bench-lat-${site.tag}-${o.seqBase}`);
  const tickMs = 50;
  const perTick = (o.readingsPerS * tickMs) / 1000;
  const started = Date.now();
  let n = 0;
  for (let k = 0; Date.now() - started < o.seconds * 1000; k += 1) {
    const ts = new Date().toISOString();
    for (let i = 0; i < perTick; i += o.batch) {
      const readings = Array.from({ length: Math.min(o.batch, perTick - i) }, () => {
        n += 1;
        return { probe: site.probes[n % site.probes.length]!.tag, ts, orpMv: 420, tempC: 40, seq: o.seqBase + n };
      });
      void device.publishAsync(batchTopic(site.tag), JSON.stringify({ readings }), { qos: 1 });
    }
    const wait = started + (k + 1) * tickMs - Date.now();
    if (wait > 0) await sleep(wait);
  }
  await sleep(2_000);
  await device.endAsync();
  await sub.endAsync();
  return { p50: quantile(lat, 0.5), p99: quantile(lat, 0.99), n: lat.length };
}
