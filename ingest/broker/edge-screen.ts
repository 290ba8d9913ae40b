import type { Logger } from 'pino';
import { parseTopic } from '../../shared/schemas/readings.ts';
import { SPARKPLUG_NAMESPACE } from '../../shared/schemas/sparkplug.ts';
import { inTransaction, type Pool } from '../../api/src/db/pool.ts';
import { insertDeadLetters, type DeadLetter } from '../../api/src/modules/readings/dead-letters.repository.ts';
import { decodeMessage } from '../../api/src/modules/readings/decode.ts';

/**
 * The dead letter for a device message that the shared decoder refuses as a whole, or null when
 * the message should go on to the ingest worker. Batches always go on (the worker refuses
 * their bad elements one by one), and so does anything that needs the plant to judge (an
 * unknown probe, a clock out of range): only the device contract itself is checked here.
 */
export function screenMessage(topic: string, payload: Buffer, receivedAtMs: number): DeadLetter | null {
  // Batches and Sparkplug (protobuf, judged by the worker's host against births) stay with the worker.
  if (parseTopic(topic)?.kind === 'batch' || topic.startsWith(`${SPARKPLUG_NAMESPACE}/`)) return null;
  const decoded = decodeMessage(topic, payload);
  if (decoded.readings.length > 0 || decoded.rejections.length === 0) return null;
  const [refused] = decoded.rejections;
  return { topic, payload: refused.payload, reason: refused.reason, receivedAtMs };
}

type Waiting = { letter: DeadLetter; done: (stored: boolean) => void };

/**
 * Dead letters refused at the broker edge, written in small batches (one INSERT per
 * lingerMs), each device's PUBACK held until its letter is committed. When the database
 * cannot take them, every waiting message is forwarded to the worker instead
 * (`done(false)`), which dead-letters it once the database is back: nothing is lost.
 */
export class EdgeDeadLetters {
  private waiting: Waiting[] = [];
  private timer: NodeJS.Timeout | null = null;
  /** Dead letters committed here since the broker started (logged with the broker's health). */
  stored = 0;

  constructor(private readonly pool: Pool, private readonly log: Logger, private readonly lingerMs = 10, private readonly maxBatch = 200) {}

  add(letter: DeadLetter, done: (stored: boolean) => void): void {
    this.waiting.push({ letter, done });
    if (this.waiting.length >= this.maxBatch) this.flushSoon(0);
    else this.flushSoon(this.lingerMs);
  }

  private flushSoon(delayMs: number): void {
    if (this.timer && delayMs > 0) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.flush();
    }, delayMs);
  }

  private async flush(): Promise<void> {
    const batch = this.waiting.splice(0, this.maxBatch);
    if (this.waiting.length > 0) this.flushSoon(0);
    if (batch.length === 0) return;
    let stored = false;
    try {
      await inTransaction(this.pool, (conn) => insertDeadLetters(conn, batch.map((w) => w.letter)));
      stored = true;
    } catch (err) {
      this.log.warn({ err: (err as Error).message, count: batch.length }, 'edge dead letters not stored; forwarding them to the worker');
    }
    if (stored) this.stored += batch.length;
    for (const w of batch) w.done(stored);
  }
}
