/**
 * MQTT broker entry point (embedded aedes, sessions persisted with level).
 * Run: node --import tsx ingest/broker.ts
 */
import { ingestConfig } from '../api/src/config.ts';
import { logger } from '../api/src/lib/logger.ts';
import { startBroker } from './broker/start-broker.ts';

const log = logger.child({ component: 'broker' });

async function main(): Promise<void> {
  const cfg = ingestConfig();
  if (!cfg.SERVICE_MQTT_PASSWORD) throw new Error('Invalid configuration:\n  SERVICE_MQTT_PASSWORD: required by the broker');
  const running = await startBroker({
    port: cfg.MQTT_PORT,
    databaseUrl: cfg.DATABASE_URL,
    dataDir: cfg.FERRISIGHT_DATA_DIR,
    servicePassword: cfg.SERVICE_MQTT_PASSWORD,
    serviceUser: cfg.SERVICE_MQTT_USER,
    maxConnections: cfg.MQTT_MAX_CONNECTIONS,
    maxConnectionsPerGateway: cfg.MQTT_MAX_CONNECTIONS_PER_GATEWAY,
    reservedServiceConnections: cfg.MQTT_RESERVED_SERVICE_CONNECTIONS,
    storeBeforeAck: cfg.MQTT_STORE_BEFORE_ACK === 'on',
    log,
  });
  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log.info({ signal }, 'broker stopping');
    const force = setTimeout(() => process.exit(0), 5_000);
    await running.close();
    clearTimeout(force);
    process.exit(0);
  };
  process.on('SIGTERM', () => void shutdown('SIGTERM'));
  process.on('SIGINT', () => void shutdown('SIGINT'));
}

main().catch((err: Error) => {
  log.fatal({ err: err.message }, 'broker failed to start');
  process.exit(1);
});
