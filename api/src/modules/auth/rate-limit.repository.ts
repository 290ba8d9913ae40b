import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit';
import { User } from '../../db/models.ts';

type Row = { hits: number; reset_ms: number };

/**
 * An express-rate-limit (and express-slow-down) store in MariaDB, so every API node counts
 * the same hits: fixed windows, incremented atomically by one upsert, expiry by the database
 * clock. Each limiter needs its own instance with its own prefix.
 */
export class MariadbRateLimitStore implements Store {
  windowMs = 60_000;
  readonly localKeys = false;

  constructor(readonly prefix: string) {}

  init(options: Options): void {
    this.windowMs = options.windowMs;
  }

  private k(key: string): string {
    return this.prefix + createHash('sha256').update(key).digest('hex');
  }

  private get db() {
    return User.sequelize!;
  }

  async get(key: string): Promise<ClientRateLimitInfo | undefined> {
    const [row] = await this.db.query<Row>(
      'SELECT hits, UNIX_TIMESTAMP(reset_at) * 1000 AS reset_ms FROM rate_limit_hits WHERE k = ? AND reset_at > NOW(3)',
      { replacements: [this.k(key)], type: QueryTypes.SELECT },
    );
    return row ? { totalHits: Number(row.hits), resetTime: new Date(Number(row.reset_ms)) } : undefined;
  }

  async increment(key: string): Promise<ClientRateLimitInfo> {
    const k = this.k(key);
    const micros = Math.round(this.windowMs * 1000);
    // One statement: a window that has ended starts again at 1 (reset_at is compared before it is replaced).
    await this.db.query(
      `INSERT INTO rate_limit_hits (k, hits, reset_at) VALUES (?, 1, NOW(3) + INTERVAL ? MICROSECOND)
       ON DUPLICATE KEY UPDATE hits = IF(reset_at <= NOW(3), 1, hits + 1), reset_at = IF(reset_at <= NOW(3), VALUES(reset_at), reset_at)`,
      { replacements: [k, micros] },
    );
    if (Math.random() < 0.01) {
      await this.db.query('DELETE FROM rate_limit_hits WHERE reset_at < NOW(3) - INTERVAL 1 DAY LIMIT 1000');
    }
    return (await this.get(key)) ?? { totalHits: 1, resetTime: new Date(Date.now() + this.windowMs) };
  }

  async decrement(key: string): Promise<void> {
    await this.db.query('UPDATE rate_limit_hits SET hits = GREATEST(hits - 1, 0) WHERE k = ? AND reset_at > NOW(3)', { replacements: [this.k(key)] });
  }

  async resetKey(key: string): Promise<void> {
    await this.db.query('DELETE FROM rate_limit_hits WHERE k = ?', { replacements: [this.k(key)] });
  }
}
