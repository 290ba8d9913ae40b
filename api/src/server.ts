import http from 'node:http';
import path from 'node:path';
import { createApp } from './app.ts';
import { config } from './config.ts';
import { initModels } from './db/models.ts';
import { Database } from './db/database.ts';
import { logger } from './lib/logger.ts';
import { createAuthService } from './modules/auth/auth.service.ts';
import { Bus } from './realtime/bus.ts';
import { attachRealtime } from './realtime/socket.ts';
import { createIngestPool } from './db/pool.ts';
import { Lease } from './cluster/lease.ts';
import { connectReadReplica } from './cluster/read-db.ts';
import { connectSocketCluster } from './cluster/socket-cluster.ts';

/** API process: HTTP API, the built web app and socket.io on one port. */
async function main(): Promise<void> {
  const cfg = config();
  const db = new Database(cfg.DATABASE_URL);
  initModels(db.sequelize);
  await db.sequelize.authenticate();

  const auth = createAuthService({ jwtSecret: cfg.JWT_SECRET, ttlS: cfg.JWT_TTL_S });
  const bus = cfg.SERVICE_MQTT_PASSWORD ? new Bus(cfg.MQTT_URL, cfg.SERVICE_MQTT_USER, cfg.SERVICE_MQTT_PASSWORD) : undefined;
  if (!bus) logger.warn('SERVICE_MQTT_PASSWORD unset: no live values from the broker');
  const app = createApp({ auth, ttlS: cfg.JWT_TTL_S, webDist: cfg.WEB_DIST, bus, dataDir: cfg.FERRISIGHT_DATA_DIR, rawRetentionDays: cfg.RAW_RETENTION_DAYS, deadLetterRetentionDays: cfg.DEAD_LETTER_RETENTION_DAYS, ackSecret: cfg.JWT_SECRET, mailDir: path.resolve(cfg.FERRISIGHT_DATA_DIR, 'mail'), https: cfg.PUBLIC_URL?.startsWith('https://') ?? false, trustProxy: cfg.TRUST_PROXY, sparkplugHostId: cfg.SPARKPLUG_HOST_ID });
  const server = http.createServer(app);
  // Several API nodes (README "Scaling out"): socket.io through Redis, alarm broadcast by the lease holder.
  const cluster = cfg.REDIS_URL ? await connectSocketCluster(cfg.REDIS_URL) : undefined;
  const leasePool = cluster ? createIngestPool(cfg.DATABASE_URL, 1) : undefined;
  const alarmLease = leasePool ? new Lease(leasePool, 'alarm-feed', { ttlMs: cfg.LEASE_TTL_S * 1000 }).start() : undefined;
  const realtime = attachRealtime(server, auth, bus, cluster && alarmLease ? { serverOptions: cluster.options, alarmLease } : undefined, cfg.PUBLIC_URL);
  const closeReplica = connectReadReplica(cfg.DATABASE_READ_URL);

  server.on('error', (err: NodeJS.ErrnoException) => {
    if (err.code === 'EADDRINUSE') logger.fatal(`Port ${cfg.PORT} is taken: set PORT to a free port`);
    else logger.fatal({ err }, 'server error');
    process.exit(1);
  });
  server.listen(cfg.PORT, cfg.HOST, () => logger.info(`API listening on http://${cfg.HOST}:${cfg.PORT}`));

  const stop = async () => {
    logger.info('stopping');
    await realtime.close();
    server.close();
    await alarmLease?.stop();
    await leasePool?.end().catch(() => undefined);
    await cluster?.close();
    await closeReplica();
    await bus?.close();
    await db.close();
    process.exit(0);
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

main().catch((err) => {
  logger.fatal({ err: err.message }, 'API failed to start');
  process.exit(1);
});
