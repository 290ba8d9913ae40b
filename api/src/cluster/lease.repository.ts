import type { Pool } from '../db/pool.ts';

/** The `leases` table, by the database clock (NOW(3)), so holders on different hosts agree on expiry. */
export const leaseRepository = {
  /** Creates the lease's row, already expired, when it does not exist yet. */
  async ensureRow(pool: Pool, name: string): Promise<void> {
    await pool.query("INSERT INTO leases (name, owner, token, expires_at) VALUES (?, '', 0, '1970-01-01 00:00:01') ON DUPLICATE KEY UPDATE name = name", [name]);
  },

  /**
   * Renews the lease for owner, or takes it over when it has expired; true when owner holds it now.
   * The token goes up by one on every change of holder.
   */
  async claim(pool: Pool, name: string, owner: string, ttlMs: number): Promise<boolean> {
    // token is assigned before owner on purpose: MariaDB evaluates SET left to right.
    const r = (await pool.query(
      `UPDATE leases SET token = token + (owner <> ?), owner = ?, expires_at = NOW(3) + INTERVAL ? MICROSECOND, renewed_at = NOW(3)
        WHERE name = ? AND (owner = ? OR expires_at < NOW(3))`,
      [owner, owner, ttlMs * 1000, name, owner],
    )) as { affectedRows: number };
    return r.affectedRows === 1;
  },

  async read(pool: Pool, name: string): Promise<{ token: number; progress: number | null } | null> {
    const [row] = (await pool.query('SELECT token, progress FROM leases WHERE name = ?', [name])) as { token: number; progress: number | null }[];
    return row ? { token: Number(row.token), progress: row.progress ?? null } : null;
  },

  async saveProgress(pool: Pool, name: string, owner: string, value: number): Promise<void> {
    await pool.query('UPDATE leases SET progress = ? WHERE name = ? AND owner = ?', [value, name, owner]);
  },

  /** Hands the lease back (expires it now) if owner still holds it. */
  async release(pool: Pool, name: string, owner: string): Promise<void> {
    await pool.query("UPDATE leases SET expires_at = '1970-01-01 00:00:01' WHERE name = ? AND owner = ?", [name, owner]);
  },
};
