import { z } from 'zod';

const count = z.number().int().min(0);
const msOrNull = z.number().finite().nullable();

/** Snapshot the ingest worker publishes (retained) on its health topic; shown in Plant setup. */
export const ingestHealthSchema = z.object({
  at: z.string(),
  startedAt: z.string(),
  messages: count,
  readingsStored: count,
  duplicates: count,
  conflicts: count,
  deadLetters: count,
  flushes: count,
  flushErrors: count,
  /** Messages received and not yet acknowledged. */
  queued: count,
  /** Commit latency of recent flushes, ms. */
  flushP50Ms: msOrNull,
  flushP99Ms: msOrNull,
  /** Receive → commit of recent messages, ms (what a device waits for its PUBACK, minus network). */
  ackP99Ms: msOrNull,
  /** now − newest stored reading ts, s; null before the first reading. */
  lagS: msOrNull,
  dbUp: z.boolean(),
  mqttConnected: z.boolean(),
});
export type IngestHealth = z.infer<typeof ingestHealthSchema>;

/** One gateway login as the broker sees it. */
export const gatewayLiveSchema = z.object({ username: z.string(), connections: count, lastSeenAt: z.string(), messagesLastHour: count });
export type GatewayLive = z.infer<typeof gatewayLiveSchema>;

/** Snapshot the embedded broker publishes (retained) on its health topic. */
export const brokerHealthSchema = z.object({
  at: z.string(),
  startedAt: z.string(),
  /** Device messages that broke the device contract, dead-lettered by the broker itself. */
  deadLetteredAtEdge: count,
  connectedClients: count,
  /** Gateways seen since the broker started (absent from brokers older than this field). */
  gateways: z.array(gatewayLiveSchema).optional(),
});
export type BrokerHealth = z.infer<typeof brokerHealthSchema>;

/** One part as the plant supervisor sees it (npm start writes these to its run file). */
export const partStateSchema = z.object({
  name: z.string().max(40),
  state: z.enum(['running', 'restarting', 'stopped']),
  pid: z.number().int().nullable(),
  /** Restarts since the supervisor started, and within the last hour. */
  restarts: z.number().int().min(0),
  restartsLastHour: z.number().int().min(0),
  lastExit: z.object({ at: z.string(), how: z.string().max(200) }).nullable(),
  /** Unexpected exits in a row without a minute's stable run in between (absent from older supervisors). */
  exitsInRow: z.number().int().min(0).optional(),
  /** When a part that is restarting will be started again (the back-off grows while it keeps crashing). */
  nextStartAt: z.string().nullable(),
  since: z.string(),
});
export type PartState = z.infer<typeof partStateSchema>;

/** The part of the supervisor's run file the API reads. */
export const supervisorRunFileSchema = z.object({ pid: z.number().int(), states: z.array(partStateSchema).default([]) });

/** Each ingest worker's heartbeat as the database last saw it (the "ingest stopped" alarm's input). */
export type WorkerBeatView = { worker: string; beatAgeMs: number; upMs: number; stopped: boolean };
/** The plant-wide "ingest stopped" alarm: its open instance (null when none) and whether the condition holds. */
export type IngestAlarmView = { instanceId: number | null; state: string | null; conditionActive: boolean };
