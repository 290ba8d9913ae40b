import { z } from 'zod';
import { describeIssues } from './issues.ts';
import { tankLiveSchema } from './readings.ts';

/**
 * Topics Ferrisight's own processes use on the broker, beside the device topics. Only service
 * accounts may use them. Each payload has its schema here and is parsed where it is received.
 */
export const INTERNAL_PREFIX = 'ferrisight/internal/v1';

/** Ingest → API: the newest converted value per probe of one site after a commit (QoS 0, the database stays the record). */
export const latestTopic = (siteTag: string) => `${INTERNAL_PREFIX}/${siteTag}/latest`;
export const LATEST_FILTER = latestTopic('+');
export const latestMessageSchema = z.object({ readings: z.array(tankLiveSchema) });
export type LatestMessage = z.infer<typeof latestMessageSchema>;

/** Ingest → API: these probes' source went offline (a Sparkplug death certificate): stale at once. */
export const offlineTopic = (siteTag: string) => `${INTERNAL_PREFIX}/${siteTag}/offline`;
export const OFFLINE_FILTER = offlineTopic('+');
export const probesOfflineSchema = z.object({ probeIds: z.array(z.number().int().positive()), atMs: z.number().int() });
export type ProbesOffline = z.infer<typeof probesOfflineSchema>;

/** Ingest worker's retained health snapshot (ingestHealthSchema). */
export const INGEST_HEALTH_TOPIC = `${INTERNAL_PREFIX}/ingest/health`;
/** Embedded broker's retained health snapshot (brokerHealthSchema). */
export const BROKER_HEALTH_TOPIC = `${INTERNAL_PREFIX}/broker/health`;

/** API → ingest workers: the plant changed, reload probes and subscriptions now. */
export const CACHE_INVALIDATE_TOPIC = `${INTERNAL_PREFIX}/cache/invalidate`;
export const cacheInvalidateSchema = z.object({}).strict();

/** API or command line → simulator: simCommandSchema. */
export const SIM_COMMAND_TOPIC = `${INTERNAL_PREFIX}/sim/command`;
/** Simulator → API, retained: simStateSchema. */
export const SIM_STATE_TOPIC = `${INTERNAL_PREFIX}/sim/state`;

/**
 * Where the broker moves a device message it has dead-lettered itself: nobody subscribes to it,
 * so the message is neither forwarded nor kept in the worker's session.
 */
export const SCREENED_TOPIC = `${INTERNAL_PREFIX}/edge/screened`;

/** True for any internal topic (a device may never publish one). */
export const isInternalTopic = (topic: string) => topic.startsWith(`${INTERNAL_PREFIX}/`);

/** Parses a JSON payload with a schema; the error says which topic and field was wrong. */
export function parseInternal<T extends z.ZodType>(schema: T, topic: string, payload: Uint8Array | string): z.output<T> {
  const text = typeof payload === 'string' ? payload : new TextDecoder().decode(payload);
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (err) {
    throw new Error(`${topic}: invalid JSON: ${(err as Error).message}`);
  }
  const r = schema.safeParse(json);
  if (!r.success) throw new Error(`${topic}: ${describeIssues(r.error)}`);
  return r.data;
}
