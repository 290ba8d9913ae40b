import { z } from 'zod';
import { ALL_DEVICES_FILTER } from '../../shared/schemas/readings.ts';

/**
 * The only reader of process.env for the API, ingest, notifier and their logger; the simulator and
 * the start scripts parse their own few settings. The start script fills DATABASE_URL, JWT_SECRET
 * and SERVICE_MQTT_PASSWORD for the private services.
 */

/** Logging: every process's logger reads these, even one that needs no database. */
const loggingShape = {
  NODE_ENV: z.enum(['development', 'production', 'test']).default('production'),
  /** Unset: info, or silent under NODE_ENV=test. */
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).optional(),
  /** The part's name in each log line; the start script sets it per process. */
  FERRISIGHT_PROC: z.string().min(1).optional(),
};

const schema = z.object({
  ...loggingShape,
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(1).max(65535).default(8470),
  PUBLIC_URL: z.string().url().optional(),
  DATABASE_URL: z.string().regex(/^mariadb:\/\//, 'must start with mariadb://'),
  MQTT_URL: z.string().regex(/^mqtts?:\/\//, 'must start with mqtt:// or mqtts://').default('mqtt://127.0.0.1:8472'),
  SERVICE_MQTT_USER: z.string().default('ferrisight-service'),
  SERVICE_MQTT_PASSWORD: z.string().min(16).optional(),
  SMTP_URL: z.string().default('smtp://127.0.0.1:8473'),
  MAIL_FROM: z.string().default('Ferrisight <ferrisight@localhost>'),
  JWT_SECRET: z.string().min(32, 'must be at least 32 characters'),
  JWT_TTL_S: z.coerce.number().int().min(60).default(8 * 3600),
  /**
   * Proxies whose X-Forwarded-For names the client (sign-in limits, logs): Express 'trust proxy'
   * values, comma-separated ('loopback', '10.0.0.5', '10.0.0.0/8') or a hop count; unset: none.
   */
  TRUST_PROXY: z
    .string()
    .regex(/^[\w.:/, -]+$/, 'addresses, subnets, loopback/linklocal/uniquelocal, or a hop count')
    .transform((v): number | string[] => (/^\d+$/.test(v.trim()) ? Number(v) : v.split(',').map((x) => x.trim()).filter(Boolean)))
    .optional(),
  WEB_DIST: z.string().default('dist/web'),
  RAW_RETENTION_DAYS: z.coerce.number().int().min(1).default(90),
  /** Dead letters and reading conflicts are deleted this many days after they arrived. */
  DEAD_LETTER_RETENTION_DAYS: z.coerce.number().int().min(1).default(30),
  /** Connections one gateway login may hold at once (broker). */
  MQTT_MAX_CONNECTIONS_PER_GATEWAY: z.coerce.number().int().min(1).default(4),
  /** Of MQTT_MAX_CONNECTIONS, this many are kept for Ferrisight's own services. */
  MQTT_RESERVED_SERVICE_CONNECTIONS: z.coerce.number().int().min(1).default(50),
  INGEST_CLIENT_ID: z.string().default('ferrisight-ingest-1'),
  INGEST_TOPIC_FILTER: z.string().default(ALL_DEVICES_FILTER),
  // Broker and ingest worker (ingest/broker.ts, ingest/worker.ts).
  MQTT_PORT: z.coerce.number().int().min(1).max(65535).default(8472),
  MQTT_MAX_CONNECTIONS: z.coerce.number().int().min(1).default(2000),
  /** 'on': the embedded broker stores a device's QoS 1 message on disk before its PUBACK (store-before-ack.ts); 'off': aedes's own order. */
  MQTT_STORE_BEFORE_ACK: z.enum(['on', 'off']).default('on'),
  /** Folder for the broker's sessions, caught mail and uploads (the start script passes an absolute path). */
  FERRISIGHT_DATA_DIR: z.string().default('.data'),
  /** 'pipelined' acks after commit but keeps reading while a flush runs; 'serial' holds mqtt.js per message. */
  INGEST_ACK_MODE: z.enum(['pipelined', 'serial']).default('pipelined'),
  INGEST_FLUSH_MS: z.coerce.number().int().min(1).max(1000).default(25),
  INGEST_FLUSH_MAX_READINGS: z.coerce.number().int().min(1).max(20_000).default(2000),
  INGEST_FLUSH_CONCURRENCY: z.coerce.number().int().min(1).max(8).default(2),
  // Scale-out (README "Scaling out"; ingest/slices.ts, api/src/cluster/).
  /** 'i/n': this ingest worker's slice of the device topics; unset = one worker takes everything. */
  INGEST_SLICE: z.string().regex(/^\d+\/\d+$/, 'must be i/n, e.g. 1/2').optional(),
  INGEST_SLICE_BY: z.enum(['site', 'probe']).default('site'),
  /** Broker-side balancing ($share/<group>/…) where the site's broker supports it; not aedes. */
  INGEST_SHARED_GROUP: z.string().regex(/^[A-Za-z0-9_.-]{1,64}$/, 'letters, digits, _ . - only').optional(),
  /** Sparkplug B host id: STATE topic spBv1.0/STATE/<id> (README "Sparkplug B edge nodes"); 'off' runs no host. */
  SPARKPLUG_HOST_ID: z.string().regex(/^[A-Za-z0-9_.-]{1,64}$/, 'letters, digits, _ . - only').default('ferrisight'),
  /** Set: socket.io across API nodes through the Redis Streams adapter; unset: one API node. */
  REDIS_URL: z.string().regex(/^rediss?:\/\//, 'must start with redis:// or rediss://').optional(),
  /** A read replica for read-only trend queries; unset: DATABASE_URL. */
  DATABASE_READ_URL: z.string().regex(/^mariadb:\/\//, 'must start with mariadb://').optional(),
  /** Jobs that run once per cluster (escalation, timers, retention, alarm broadcast) move to another process within this. */
  LEASE_TTL_S: z.coerce.number().int().min(2).max(300).default(15),
  /**
   * The notifier raises "ingest stopped" when an ingest worker has not beaten its heartbeat for
   * this long, or keeps being restarted; it clears once every worker has run this long again.
   */
  INGEST_STOPPED_AFTER_S: z.coerce.number().int().min(10).max(600).default(20),
});

export type Config = z.infer<typeof schema>;

let cached: Config | undefined;

/** Throws with the list of bad keys when the environment does not fit. */
function parseEnv<T extends z.ZodType>(s: T): z.infer<T> {
  const parsed = s.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
    throw new Error(`Invalid configuration:\n${lines.join('\n')}`);
  }
  return parsed.data;
}

/** Parses the environment once; throws with the list of bad keys when it does not fit. */
export function config(): Config {
  cached ??= parseEnv(schema);
  return cached;
}

/** Ingest processes (broker, worker) sign no tokens, so they do not need JWT_SECRET. */
export function ingestConfig(): Omit<Config, 'JWT_SECRET'> {
  return parseEnv(schema.omit({ JWT_SECRET: true }));
}

export type LoggingConfig = z.infer<z.ZodObject<typeof loggingShape>>;

/** The logging settings alone, for processes (simulator, balancer, mail catcher) without the rest. */
export function loggingConfig(): LoggingConfig {
  return parseEnv(z.object(loggingShape));
}
