import type { Logger } from 'pino';
import { Database } from '../api/src/db/database.ts';
import { logger as rootLogger } from '../api/src/lib/logger.ts';
import { createAlarmEngine } from '../api/src/modules/alarms/engine.ts';
import { queueAlarmReadings } from '../api/src/modules/alarms/engine-queue.ts';
import { ALL_DEVICES_FILTER } from '../shared/schemas/readings.ts';
import { CACHE_INVALIDATE_TOPIC, INGEST_HEALTH_TOPIC, cacheInvalidateSchema, parseInternal } from '../shared/schemas/internal-topics.ts';
import { Flusher } from './flusher.ts';
import { LivePublisher, toTankLive } from './live.ts';
import { IngestMetrics } from './metrics.ts';
import { startIntake, type AckMode, type Intake } from './mqtt-intake.ts';
import { ProbeCache } from '../api/src/modules/readings/probe-cache.ts';
import { deleteExpiredReadings, deleteExpiredRefusals } from '../api/src/modules/readings/retention.repository.ts';
import { Lease } from '../api/src/cluster/lease.ts';
import { systemAlarmsRepository } from '../api/src/modules/system-alarms/system-alarms.repository.ts';
import { loadTags, SliceSubscriptions, type SlicePlan } from './slices.ts';
import { startSparkplugHost } from './sparkplug/connection.ts';

export type WorkerOptions = {
  databaseUrl: string;
  mqttUrl: string;
  username: string;
  password: string;
  clientId: string;
  topicFilter?: string;
  retentionDays?: number;
  /** Dead letters and conflicts older than this are deleted (default 30). */
  deadLetterRetentionDays?: number;
  ackMode?: AckMode;
  lingerMs?: number;
  maxReadingsPerFlush?: number;
  maxQueuedReadings?: number;
  /** Flush transactions committing at once (pipelined mode only). */
  flushConcurrency?: number;
  cacheRefreshMs?: number;
  healthIntervalMs?: number;
  /** How often the worker beats its liveness row while it can take readings (the notifier's "ingest stopped" watch). */
  heartbeatMs?: number;
  retentionIntervalMs?: number;
  /** This worker's share of the device topics (README "Scaling out"); unset: all of topicFilter. */
  slice?: SlicePlan | null;
  /** Sliced workers run retention under a database lease of this TTL, so one of them does it. */
  leaseTtlMs?: number;
  /** Sparkplug B host id (README "Sparkplug B edge nodes"); null or 'off': no host. Sliced, only slice 1 runs it. */
  sparkplugHostId?: string | null;
  log?: Logger;
};

export type RunningWorker = {
  metrics: IngestMetrics;
  /** Resolves once the broker has confirmed the subscription (first connection). */
  subscribed: Promise<void>;
  /** Resolves once the Sparkplug host is online (at once when none runs). */
  sparkplugReady: Promise<void>;
  stop: () => Promise<void>;
};

/**
 * Starts the ingest worker in this process (worker.ts is the CLI around it; tests call it
 * directly). Never throws for a missing database: the flusher retries until it is back.
 */
export async function startWorker(opts: WorkerOptions): Promise<RunningWorker> {
  const log = opts.log ?? rootLogger.child({ component: 'ingest-worker' });
  const retentionDays = opts.retentionDays ?? 90;
  // The raw pool carries the hot path; the alarm engine reads through Sequelize on the same database.
  const db = new Database(opts.databaseUrl, { poolMax: 3, rawPoolMax: 4 });
  const { pool } = db;
  const metrics = new IngestMetrics();
  const cache = new ProbeCache(pool);
  await cache.reload().catch((err: Error) => log.warn({ err: err.message }, 'probe cache not loaded yet; will retry'));
  // Alarms are evaluated from what was committed, off the acknowledgement path.
  const alarms = queueAlarmReadings(createAlarmEngine({ sequelize: db.sequelize }), log);

  let live: LivePublisher | null = null;
  let corked: Intake['corked'] | null = null;
  const flusher = new Flusher({
    pool, cache, metrics, log, retentionDays,
    // In serial mode nothing else can arrive on the connection while a message waits: never linger.
    lingerMs: opts.ackMode === 'serial' ? 0 : opts.lingerMs ?? 25,
    maxReadings: opts.maxReadingsPerFlush ?? 2000,
    maxQueuedReadings: opts.maxQueuedReadings ?? 20_000,
    maxInFlight: opts.ackMode === 'serial' ? 1 : opts.flushConcurrency ?? 2,
    sendAcks: (send) => (corked ? corked(send) : send()),
    onCommitted: (inserted) => {
      live?.publish(inserted);
      alarms.push(inserted.map(toTankLive));
    },
  });
  const reloadCache = () => cache.reload().catch((err: Error) => log.warn({ err: err.message }, 'probe cache reload failed'));
  const plan = opts.slice ?? null;
  const topicFilter = opts.topicFilter ?? ALL_DEVICES_FILTER;
  const intake = startIntake({
    mqttUrl: opts.mqttUrl, username: opts.username, password: opts.password, clientId: opts.clientId,
    topicFilter: plan ? null : topicFilter, ackMode: opts.ackMode ?? 'pipelined', flusher, metrics, log,
    onInternal: (topic, payload) => {
      if (topic !== CACHE_INVALIDATE_TOPIC) return;
      try {
        parseInternal(cacheInvalidateSchema, topic, payload);
      } catch (err) {
        log.warn({ err: (err as Error).message }, 'ignored unreadable internal message');
        return;
      }
      void refresh();
    },
  });
  // Sliced: subscriptions follow the plant (a new site or probe joins its slice at the next refresh).
  const slices = plan ? new SliceSubscriptions(intake.client, plan, () => loadTags(pool), log, topicFilter) : null;
  // One host per broker: Sparkplug sequence numbers are per edge node, so its messages must not be split over workers.
  const hostId = opts.sparkplugHostId === undefined ? 'ferrisight' : opts.sparkplugHostId;
  const sparkplug = hostId && hostId !== 'off' && (!plan || plan.index === 1)
    ? startSparkplugHost({ mqttUrl: opts.mqttUrl, username: opts.username, password: opts.password, hostId, pool, flusher, metrics, log })
    : null;
  const refresh = () => Promise.all([reloadCache(), slices?.sync(), sparkplug?.reload()]);
  const retentionLease = plan ? new Lease(pool, 'ingest-retention', { ttlMs: opts.leaseTtlMs, log }).start() : null;
  live = new LivePublisher(intake.client);
  corked = intake.corked;

  const health = () => {
    const snap = metrics.snapshot({ queued: flusher.queued, mqttConnected: intake.client.connected });
    log.info(snap, 'ingest health');
    if (intake.client.connected) intake.client.publish(INGEST_HEALTH_TOPIC, JSON.stringify(snap), { qos: 0, retain: true });
  };
  // Beats only while connected to the broker, and only if the database takes the write: both are needed to store readings.
  let firstBeat = true;
  const heartbeat = async () => {
    if (!intake.client.connected) return;
    try {
      await systemAlarmsRepository.beat(db.sequelize, opts.clientId, firstBeat);
      firstBeat = false;
    } catch (err) {
      log.warn({ err: (err as Error).message }, 'heartbeat not written');
    }
  };
  let retentionRunning = false;
  const retention = async () => {
    if (retentionRunning || (retentionLease && !retentionLease.held)) return;
    retentionRunning = true;
    await deleteExpiredReadings(pool, retentionDays, log).catch((err: Error) => log.warn({ err: err.message }, 'retention run failed'));
    await deleteExpiredRefusals(pool, opts.deadLetterRetentionDays ?? 30, log)
      .catch((err: Error) => log.warn({ err: err.message }, 'dead-letter retention run failed'));
    retentionRunning = false;
  };
  const timers = [
    setInterval(refresh, opts.cacheRefreshMs ?? 10_000),
    setInterval(health, opts.healthIntervalMs ?? 30_000),
    setInterval(heartbeat, opts.heartbeatMs ?? 5_000),
    setInterval(retention, opts.retentionIntervalMs ?? 3_600_000),
    setTimeout(retention, 60_000),
  ];
  void intake.subscribed.then(heartbeat, () => undefined);

  return {
    metrics,
    sparkplugReady: sparkplug?.ready ?? Promise.resolve(),
    subscribed: slices ? Promise.all([intake.subscribed, slices.firstSync]).then(() => undefined) : intake.subscribed,
    async stop() {
      for (const t of timers) clearTimeout(t);
      await retentionLease?.stop();
      intake.stopTaking();
      await sparkplug?.stop();
      await flusher.stop();
      // Graceful end writes the PUBACKs of the last commit before DISCONNECT; force after 2 s.
      await Promise.race([intake.client.endAsync(false), new Promise((r) => setTimeout(r, 2_000))]);
      if (!intake.client.disconnected) await intake.client.endAsync(true).catch(() => undefined);
      await alarms.drain();
      await systemAlarmsRepository.stopped(db.sequelize, opts.clientId).catch(() => undefined);
      await db.close().catch(() => undefined);
    },
  };
}
