import { z } from 'zod';
import { alarmEventViewSchema, type AlarmEventView } from './alarms.ts';
import { isoTimestampSchema, tankLiveSchema, type TankLive } from './readings.ts';

/**
 * The socket.io contract between the API and browsers: event names and payloads. The server
 * types its `Server` and the web its `Socket` with these maps; each side parses what it receives.
 */

/** probe:freshness: a probe turned stale (three expected intervals without a reading) or fresh again. */
export const probeFreshnessSchema = z.object({
  probeId: z.number().int().positive(),
  tankId: z.number().int().positive(),
  stale: z.boolean(),
  lastTs: isoTimestampSchema.nullable(),
});
export type ProbeFreshness = z.infer<typeof probeFreshnessSchema>;

export const alarmResyncSchema = z.object({ lastEventId: z.number().int().min(0) });
export type AlarmResync = z.infer<typeof alarmResyncSchema>;

/** alarm:since: the last alarm event id the client has. */
export const alarmSinceSchema = z.number().int().min(0);

/**
 * Handshake `auth`: a session token (scripts; browsers use the cookie) and the last alarm event
 * id the page has, so a reconnect replays what was missed. Anything unreadable counts as absent.
 */
export const socketAuthSchema = z.object({
  token: z.string().optional().catch(undefined),
  lastAlarmEventId: z.coerce.number().int().min(0).optional().catch(undefined),
}).catch({});
export type SocketAuth = z.infer<typeof socketAuthSchema>;

/**
 * live:watch: the sites whose live values a screen shows ('all' for every site). A socket starts
 * watching every site; a screen that shows fewer says so and receives only those.
 */
export const liveWatchSchema = z.object({
  sites: z.union([z.literal('all'), z.array(z.string().min(1).max(40)).max(1000)]),
});
export type LiveWatch = z.infer<typeof liveWatchSchema>;

export interface ServerToClientEvents {
  'tank:latest': (readings: TankLive[]) => void;
  'probe:freshness': (f: ProbeFreshness) => void;
  'session:expired': () => void;
  /** One alarm lifecycle event; ids are monotonic, replayed after a reconnect (may arrive twice or out of order). */
  'alarm:event': (e: AlarmEventView) => void;
  /** Too much was missed to replay: reload the alarm lists. */
  'alarm:resync': (p: AlarmResync) => void;
}

export interface ClientToServerEvents {
  'alarm:since': (afterId: number) => void;
  'live:watch': (watch: LiveWatch) => void;
}

export type ServerEventName = keyof ServerToClientEvents;

/** The payload schema of each server event that carries one (session:expired carries none). */
export const serverEventSchemas = {
  'tank:latest': z.array(tankLiveSchema),
  'probe:freshness': probeFreshnessSchema,
  'alarm:event': alarmEventViewSchema,
  'alarm:resync': alarmResyncSchema,
} satisfies { [E in ServerEventName]?: z.ZodType<Parameters<ServerToClientEvents[E]>[0]> };
