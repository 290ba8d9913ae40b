/**
 * Ingest worker entry point: MQTT (QoS 1, clean: false) → validate → convert → MariaDB,
 * acknowledging each message only after its readings are committed.
 * Run: node --import tsx ingest/worker.ts
 */
import { ingestConfig } from '../api/src/config.ts';
import { logger } from '../api/src/lib/logger.ts';
import { parseSlice, sliceClientId } from './slices.ts';
import { startWorker } from './start-worker.ts';

const log = logger.child({ component: 'ingest-worker' });

async function main(): Promise<void> {
  const cfg = ingestConfig();
  if (!cfg.SERVICE_MQTT_PASSWORD) throw new Error('Invalid configuration:\n  SERVICE_MQTT_PASSWORD: required by the ingest worker');
  // Several workers: each takes its slice under its own session (README "Scaling out").
  const slice = parseSlice(cfg.INGEST_SLICE, cfg.INGEST_SLICE_BY, cfg.INGEST_SHARED_GROUP);
  const clientId = sliceClientId(cfg.INGEST_CLIENT_ID, slice);
  const worker = await startWorker({
    databaseUrl: cfg.DATABASE_URL,
    mqttUrl: cfg.MQTT_URL,
    username: cfg.SERVICE_MQTT_USER,
    password: cfg.SERVICE_MQTT_PASSWORD,
    clientId,
    slice,
    leaseTtlMs: cfg.LEASE_TTL_S * 1000,
    topicFilter: cfg.INGEST_TOPIC_FILTER,
    retentionDays: cfg.RAW_RETENTION_DAYS,
    deadLetterRetentionDays: cfg.DEAD_LETTER_RETENTION_DAYS,
    ackMode: cfg.INGEST_ACK_MODE,
    lingerMs: cfg.INGEST_FLUSH_MS,
    maxReadingsPerFlush: cfg.INGEST_FLUSH_MAX_READINGS,
    flushConcurrency: cfg.INGEST_FLUSH_CONCURRENCY,
    sparkplugHostId: cfg.SPARKPLUG_HOST_ID,
    log,
  });
  log.info({ clientId, filter: cfg.INGEST_TOPIC_FILTER, slice: cfg.INGEST_SLICE, ackMode: cfg.INGEST_ACK_MODE }, 'ingest worker started');

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info({ signal }, 'stopping: finishing the current flush, leaving the rest unacknowledged');
    await worker.stop();
    log.info('ingest worker stopped');
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
  // Unacknowledged work is safe with the broker, but a stray rejection (a dropped DB
  // connection mid-query) is no reason to stop ingesting: log it and carry on.
  process.on('unhandledRejection', (err) => log.error({ err: String(err) }, 'unhandled rejection'));
}

main().catch((err: Error) => {
  log.fatal({ err: err.message }, 'ingest worker failed to start');
  process.exit(1);
});
