/** Snapshot the ingest worker publishes (retained) on ferrisight/internal/v1/ingest/health; shown in Plant setup. */
export type IngestHealth = {
  at: string;
  startedAt: string;
  messages: number;
  readingsStored: number;
  duplicates: number;
  conflicts: number;
  deadLetters: number;
  flushes: number;
  flushErrors: number;
  /** Messages received and not yet acknowledged. */
  queued: number;
  /** Commit latency of recent flushes, ms. */
  flushP50Ms: number | null;
  flushP99Ms: number | null;
  /** Receive → commit of recent messages, ms (what a device waits for its PUBACK, minus network). */
  ackP99Ms: number | null;
  /** now − newest stored reading ts, s; null before the first reading. */
  lagS: number | null;
  dbUp: boolean;
  mqttConnected: boolean;
};

/** Snapshot the embedded broker publishes (retained) on ferrisight/internal/v1/broker/health. */
export type BrokerHealth = {
  at: string;
  startedAt: string;
  /** Device messages that broke the device contract, dead-lettered by the broker itself. */
  deadLetteredAtEdge: number;
  connectedClients: number;
};
