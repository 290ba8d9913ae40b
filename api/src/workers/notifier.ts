/**
 * Notifier process: the alarm engine's timer (stale probes, shelve expiry, offline suppression,
 * probe-check and calibration-drift alarms), the plant-wide "ingest stopped" alarm (it outlives
 * the worker it watches) and e-mail escalation from the outbox.
 *   node --import tsx api/src/workers/notifier.ts
 * Env (api/src/config.ts): DATABASE_URL, SMTP_URL, MAIL_FROM, PUBLIC_URL (default
 * http://127.0.0.1:PORT), JWT_SECRET (signs the acknowledge links).
 * Safe to run more than once and to kill at any moment: the outbox key (instance, step) and the
 * alarm lock make every step happen once; unsent mail stays in the outbox for the next start.
 * Several notifiers (one per node, README "Scaling out") take turns through the database lease
 * 'notifier': one works, the others stand by and take over within LEASE_TTL_S of its death.
 */
import { config } from '../config.ts';
import { initModels } from '../db/models.ts';
import { Database } from '../db/database.ts';
import { logger } from '../lib/logger.ts';
import { createAlarmEngine } from '../modules/alarms/engine.ts';
import { assaysService } from '../modules/assays/assays.service.ts';
import { probeChecksService } from '../modules/probe-checks/probe-checks.service.ts';
import { createNotifier } from '../modules/notify/notifier.ts';
import { createIngestPool } from '../db/pool.ts';
import { Lease } from '../cluster/lease.ts';
import { supervisedParts } from '../modules/admin/supervisor-status.ts';
import { createIngestWatch } from '../modules/system-alarms/ingest-watch.service.ts';

const TICK_MS = 5_000;
const MAIL_MS = 2_000;

async function main(): Promise<void> {
  const cfg = config();
  const db = new Database(cfg.DATABASE_URL, { poolMax: 4 });
  const { sequelize } = db;
  initModels(sequelize);
  for (let attempt = 1; ; attempt += 1) {
    try {
      await sequelize.authenticate();
      break;
    } catch (err) {
      if (attempt >= 30) throw err;
      logger.warn({ err: (err as Error).message }, 'database not reachable yet; retrying');
      await new Promise((r) => setTimeout(r, 1000));
    }
  }
  const engine = createAlarmEngine({
    sequelize,
    inputs: {
      calibrationDriftMv: (tankId) => assaysService.latestAssayDriftMv(tankId),
      probeCheckDue: async (now) => (await probeChecksService.due(now)).map((d) => ({ tankId: d.tankId, dueAt: d.dueAt })),
    },
  });
  const notifier = createNotifier({
    sequelize, smtpUrl: cfg.SMTP_URL, mailFrom: cfg.MAIL_FROM, ackSecret: cfg.JWT_SECRET,
    publicUrl: cfg.PUBLIC_URL ?? `http://127.0.0.1:${cfg.PORT}`,
  });
  const ingestWatch = createIngestWatch({ sequelize, thresholdS: cfg.INGEST_STOPPED_AFTER_S, parts: () => supervisedParts(cfg.FERRISIGHT_DATA_DIR) });
  logger.info({ smtp: cfg.SMTP_URL.replace(/\/\/[^@/]*@/, '//***@') }, 'notifier running');
  const leasePool = createIngestPool(cfg.DATABASE_URL, 1);
  const lease = new Lease(leasePool, 'notifier', { ttlMs: cfg.LEASE_TTL_S * 1000 }).start();

  let stopping = false;
  let lastTick = 0;
  // One loop, one pass at a time: a slow database or relay delays the next pass, never overlaps it.
  const loop = async () => {
    while (!stopping) {
      const started = Date.now();
      try {
        if (!lease.held) {
          // Standing by: another notifier holds the lease.
          lastTick = 0;
          ingestWatch.reset();
        } else {
          if (started - lastTick >= TICK_MS) {
            lastTick = started;
            await engine.tick();
          }
          const w = await ingestWatch.check();
          if (w.changed) logger.warn({ why: w.verdict.why || undefined }, `ingest-stopped alarm ${w.changed}`);
        }
        const r = lease.held ? await notifier.runOnce() : undefined;
        if (r && (r.queued || r.sent || r.failed || r.cancelled)) logger.info(r, 'escalation pass');
      } catch (err) {
        logger.error({ err: (err as Error).message }, 'notifier pass failed; retrying');
      }
      await new Promise((r) => setTimeout(r, Math.max(100, MAIL_MS - (Date.now() - started))));
    }
  };
  const running = loop();

  const stop = async () => {
    stopping = true;
    await running;
    await lease.stop();
    await leasePool.end().catch(() => undefined);
    notifier.close();
    await db.close();
    process.exit(0);
  };
  process.once('SIGTERM', stop);
  process.once('SIGINT', stop);
}

main().catch((err) => {
  logger.fatal({ err: (err as Error).message }, 'notifier failed to start');
  process.exit(1);
});
