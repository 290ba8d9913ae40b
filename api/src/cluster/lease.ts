import { randomBytes } from 'node:crypto';
import os from 'node:os';
import type { Logger } from 'pino';
import type { Pool } from '../db/pool.ts';
import { logger as rootLogger } from '../lib/logger.ts';
import { leaseRepository } from './lease.repository.ts';

export type LeaseOptions = {
  /** How long a renewal keeps the lease, by the database clock. */
  ttlMs?: number;
  /** How often the holder renews and a waiting process retries; default ttl / 3. */
  renewMs?: number;
  /** Unique per process; default host:pid:random. */
  owner?: string;
  log?: Logger;
};

/**
 * A database lease (table `leases`, migration 20261201-0900): the job it names runs on one
 * process of the cluster at a time, and moves to another within about one TTL when its holder
 * dies (kill -9, lost network) or at once when it stops cleanly.
 *
 * Why a row with an expiry rather than GET_LOCK: it also works through Galera and a proxy
 * (GET_LOCK is local to one Galera node), it needs no connection held open, and the holder
 * can record how far it got (`progress`). The lease keeps the work single, but it is not what
 * makes it correct: a paused holder may overlap its successor for a moment, so every job under
 * a lease stays idempotent (outbox keys, alarm lock, upserts) — the lease only avoids doing the
 * work N times.
 */
export class Lease {
  readonly owner: string;
  private readonly ttlMs: number;
  private readonly renewMs: number;
  private readonly log: Logger;
  /** Local monotonic deadline, counted from when the last successful renewal was *sent*. */
  private validUntil = 0;
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<void> | null = null;
  private rowReady = false;
  token = 0;
  progress: number | null = null;

  constructor(private readonly pool: Pool, readonly name: string, opts: LeaseOptions = {}) {
    this.ttlMs = opts.ttlMs ?? 15_000;
    this.renewMs = opts.renewMs ?? Math.max(200, Math.floor(this.ttlMs / 3));
    this.owner = (opts.owner ?? `${os.hostname()}:${process.pid}:${randomBytes(3).toString('hex')}`).slice(0, 128);
    this.log = (opts.log ?? rootLogger).child({ lease: name });
  }

  /**
   * True while this process holds the lease. A margin of one renewal period is kept, so a
   * holder that cannot reach the database stops working before anyone else may take over.
   */
  get held(): boolean {
    return performance.now() < this.validUntil;
  }

  /** One acquire-or-renew attempt; resolves to whether the lease is held afterwards. */
  async tryAcquire(): Promise<boolean> {
    const sentAt = performance.now();
    const was = this.held;
    try {
      if (!this.rowReady) {
        await leaseRepository.ensureRow(this.pool, this.name);
        this.rowReady = true;
      }
      if (await leaseRepository.claim(this.pool, this.name, this.owner, this.ttlMs)) {
        this.validUntil = sentAt + this.ttlMs - this.renewMs;
        if (!was) {
          const row = await leaseRepository.read(this.pool, this.name);
          this.token = row?.token ?? 0;
          this.progress = row?.progress ?? null;
          this.log.info({ owner: this.owner, token: this.token }, 'lease acquired');
        }
      } else {
        if (was) this.log.warn({ owner: this.owner }, 'lease lost to another process');
        this.validUntil = 0;
      }
    } catch (err) {
      // Unreachable database: keep working until the local deadline, then stand down.
      this.log.warn({ err: (err as Error).message }, 'lease renewal failed');
    }
    return this.held;
  }

  /** Acquires and renews in the background until stop(). */
  start(): this {
    const loop = () => {
      this.running = this.tryAcquire().then(() => undefined);
      void this.running.finally(() => {
        if (this.timer !== undefined) this.timer = setTimeout(loop, this.renewMs);
      });
    };
    this.timer = setTimeout(loop, 0);
    return this;
  }

  /** Records the holder's work position (only while held), for a successor to resume from. */
  async saveProgress(value: number): Promise<void> {
    if (!this.held) return;
    this.progress = value;
    await leaseRepository.saveProgress(this.pool, this.name, this.owner, value);
  }

  /** Stops renewing and hands the lease back, so a successor need not wait for the expiry. */
  async stop(): Promise<void> {
    const t = this.timer;
    this.timer = undefined;
    if (t) clearTimeout(t);
    await this.running?.catch(() => undefined);
    if (!this.held) return;
    this.validUntil = 0;
    await leaseRepository
      .release(this.pool, this.name, this.owner)
      .catch((err: Error) => this.log.warn({ err: err.message }, 'lease release failed; it expires on its own'));
    this.log.info({ owner: this.owner }, 'lease released');
  }
}
