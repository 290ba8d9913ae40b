import type { Logger } from 'pino';
import { inTransaction, type Pool } from '../api/src/db/pool.ts';
import { insertDeadLetters, type DeadLetter } from '../api/src/modules/readings/dead-letters.repository.ts';
import type { Decoded } from '../api/src/modules/readings/decode.ts';
import type { IngestMetrics } from './metrics.ts';
import { processDecoded, type ConvertedReading } from '../api/src/modules/readings/convert.ts';
import type { ProbeCache, ProbeLookup } from '../api/src/modules/readings/probe-cache.ts';
import { storeReadings, type StoreResult } from '../api/src/modules/readings/readings.repository.ts';

/** One received message waiting for its commit; `ack` sends the PUBACK, `isStale` is true once its connection is gone. */
export type QueueItem = {
  topic: string;
  payload: Buffer;
  receivedAtMs: number;
  decoded: Decoded;
  ack: () => void;
  isStale: () => boolean;
};

/** Writes one flush in one transaction. */
export type StoreFlush = (readings: ConvertedReading[], letters: DeadLetter[]) => Promise<StoreResult>;

export type FlusherOptions = {
  pool: Pool;
  cache: ProbeLookup & Pick<ProbeCache, 'ensure'>;
  /** Defaults to storeReadings and insertDeadLetters in one MariaDB transaction on `pool`. */
  store?: StoreFlush;
  metrics: IngestMetrics;
  log: Logger;
  retentionDays: number;
  /** How long the first message of an idle queue waits for company, ms (0 = next tick). */
  lingerMs: number;
  /** Readings per transaction. */
  maxReadings: number;
  /** Above this many queued readings, intake stops reading from the broker. */
  maxQueuedReadings: number;
  /** Transactions committing at once (each on its own connection); 1 = strictly one after another. */
  maxInFlight?: number;
  onCommitted: (inserted: ConvertedReading[]) => void;
  /** Runs a flush's acknowledgements; the intake corks its socket around them (one write, not one per PUBACK). */
  sendAcks?: (send: () => void) => void;
};

const weight = (item: QueueItem) => Math.max(1, item.decoded.readings.length);

/**
 * Group commit: everything queued is converted and committed in one transaction, then every
 * message of that transaction is acknowledged. A failed commit acknowledges nothing and is
 * retried with backoff until MariaDB answers; the worker never exits on a DB error, and
 * anything still unacknowledged is redelivered by the broker (clean: false session).
 *
 * Up to maxInFlight transactions commit at once, so one batch's round trips and fsync overlap
 * the next one's work. What follows a commit — the PUBACKs and onCommitted (live push, alarm
 * evaluation) — still runs strictly in the order the batches were taken: PUBACKs go out in the
 * order the PUBLISHes arrived (MQTT-4.6.0-2) and the alarm engine sees readings in order.
 */
export class Flusher {
  private queue: QueueItem[] = [];
  private queuedReadings = 0;
  private running: Promise<void> | null = null;
  private timer: NodeJS.Timeout | null = null;
  private stopping = false;
  private readonly wakers = new Set<() => void>();
  private roomWaiters: (() => void)[] = [];

  constructor(private readonly o: FlusherOptions) {}

  get queued(): number {
    return this.queue.length;
  }

  hasRoom(): boolean {
    return this.queuedReadings < this.o.maxQueuedReadings;
  }

  /** Resolves once the queue has room again (backpressure for the MQTT intake). */
  waitForRoom(): Promise<void> {
    return this.hasRoom() ? Promise.resolve() : new Promise((resolve) => this.roomWaiters.push(resolve));
  }

  enqueue(item: QueueItem): void {
    if (this.stopping) return;
    this.queue.push(item);
    this.queuedReadings += weight(item);
    this.schedule();
  }

  /** Finishes the flush in progress (acking it) and leaves the rest unacknowledged. */
  async stop(): Promise<void> {
    this.stopping = true;
    if (this.timer) clearTimeout(this.timer);
    for (const wake of this.wakers) wake();
    await this.running;
  }

  private schedule(): void {
    if (this.running || this.timer || this.stopping) return;
    const full = this.queuedReadings >= this.o.maxReadings;
    this.timer = setTimeout(() => {
      this.timer = null;
      this.running = this.drain().finally(() => {
        this.running = null;
        if (this.queue.length > 0) this.schedule();
      });
    }, full ? 0 : this.o.lingerMs);
  }

  private async drain(): Promise<void> {
    const maxInFlight = Math.max(1, this.o.maxInFlight ?? 1);
    const inFlight = new Set<Promise<void>>();
    // Resolves once every earlier batch is acknowledged (or given up); false once one was given up.
    let previous: Promise<boolean> = Promise.resolve(true);
    while (true) {
      while (!this.stopping && this.queue.length > 0 && inFlight.size < maxInFlight) {
        const batch = this.take();
        const committed = this.commitWithRetry(batch);
        const before = previous;
        const settled = (async () => {
          const [inOrder, inserted] = await Promise.all([before, committed]);
          // A batch given up (only while stopping) leaves everything after it unacknowledged: the broker resends.
          if (!inOrder || inserted === null) return false;
          this.afterCommit(batch, inserted);
          return true;
        })();
        previous = settled;
        const tracked: Promise<void> = settled.then(() => { inFlight.delete(tracked); });
        inFlight.add(tracked);
      }
      if (inFlight.size === 0) return;
      await Promise.race(inFlight);
    }
  }

  /** In take order: PUBACKs, then the live push and alarm evaluation, then room for the intake. */
  private afterCommit(batch: QueueItem[], inserted: ConvertedReading[]): void {
    const sendAcks = this.o.sendAcks ?? ((send: () => void) => send());
    sendAcks(() => {
      for (const item of batch) item.ack();
    });
    try {
      this.o.onCommitted(inserted);
    } catch (err) {
      // Committed is committed: a failing live push must not turn into a retry (and duplicates).
      this.o.log.warn({ err: (err as Error).message }, 'live publish failed');
    }
    while (this.hasRoom() && this.roomWaiters.length > 0) this.roomWaiters.shift()!();
  }

  /** Oldest first, up to maxReadings (always at least one message); stale ones are dropped: the broker resends them. */
  private take(): QueueItem[] {
    const batch: QueueItem[] = [];
    let readings = 0;
    while (this.queue.length > 0) {
      const next = this.queue[0];
      if (batch.length > 0 && readings + weight(next) > this.o.maxReadings) break;
      this.queue.shift();
      this.queuedReadings -= weight(next);
      if (next.isStale()) continue;
      batch.push(next);
      readings += weight(next);
    }
    return batch;
  }

  /** The readings inserted, or null when given up (only while stopping). */
  private async commitWithRetry(initial: QueueItem[]): Promise<ConvertedReading[] | null> {
    let batch = initial;
    for (let attempt = 0; ; attempt += 1) {
      if (attempt > 0) {
        if (this.stopping) return null;
        batch = batch.filter((item) => !item.isStale());
        if (batch.length === 0) return [];
      }
      try {
        const inserted = await this.commitOnce(batch);
        if (!this.o.metrics.dbUp) this.o.log.info({ attempts: attempt + 1 }, 'database back, flush committed');
        this.o.metrics.dbUp = true;
        return inserted;
      } catch (err) {
        this.o.metrics.flushErrors += 1;
        this.o.metrics.dbUp = false;
        const delayMs = Math.min(5_000, 100 * 2 ** Math.min(attempt, 6)) * (0.75 + Math.random() / 2);
        const e = err as { message?: string; code?: string; errno?: number };
        this.o.log[attempt === 0 ? 'warn' : 'debug']({ err: e.message, code: e.code, attempt, delayMs: Math.round(delayMs), messages: batch.length },
          'flush failed, nothing acknowledged; retrying');
        await new Promise<void>((resolve) => {
          const wake = () => {
            clearTimeout(t);
            this.wakers.delete(wake);
            resolve();
          };
          const t = setTimeout(wake, delayMs);
          this.wakers.add(wake);
        });
      }
    }
  }

  private async commitOnce(batch: QueueItem[]): Promise<ConvertedReading[]> {
    const started = performance.now();
    // Unknown probes may just be new: reload before refusing them (throws while the DB is down).
    await this.o.cache.ensure(batch.flatMap((item) => item.decoded.readings.map((r) => r.probeTag)));
    const readings: ConvertedReading[] = [];
    const letters: DeadLetter[] = [];
    for (const item of batch) {
      const res = processDecoded(item.decoded, item.payload, this.o.cache, { receivedAtMs: item.receivedAtMs, retentionDays: this.o.retentionDays });
      readings.push(...res.readings);
      for (const r of res.rejections) letters.push({ topic: item.topic, payload: r.payload, reason: r.reason, receivedAtMs: item.receivedAtMs });
    }
    const store: StoreFlush = this.o.store ?? ((rs, ls) => inTransaction(this.o.pool, async (conn) => {
      const stored = await storeReadings(conn, rs, 'mqtt');
      await insertDeadLetters(conn, ls);
      return stored;
    }));
    const result = await store(readings, letters);
    const m = this.o.metrics;
    m.readingsStored += result.stored;
    m.duplicates += result.duplicates;
    m.conflicts += result.conflicts;
    m.deadLetters += letters.length;
    const newest = result.inserted.reduce<number | null>((max, r) => (max === null || r.tsMs > max ? r.tsMs : max), null);
    m.recordFlush(performance.now() - started, batch.map((item) => item.receivedAtMs), newest);
    if (letters.length > 0) this.o.log.info({ count: letters.length, first: letters[0].reason }, 'dead-lettered');
    if (result.conflicts > 0) this.o.log.warn({ count: result.conflicts }, 'conflicting duplicates logged');
    return result.inserted;
  }
}
