import type { Sequelize, Transaction } from 'sequelize';

const RETRYABLE = new Set([1213, 1205]); // ER_LOCK_DEADLOCK, ER_LOCK_WAIT_TIMEOUT

/**
 * Runs a transaction, retrying it when InnoDB picks it as a deadlock victim or a lock wait
 * times out: both roll the whole transaction back, so running it again is safe.
 */
export async function retryTransaction<T>(sequelize: Sequelize, work: (tx: Transaction) => Promise<T>, attempts = 5): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await sequelize.transaction(work);
    } catch (err) {
      const errno = (err as { parent?: { errno?: number }; original?: { errno?: number } }).parent?.errno
        ?? (err as { original?: { errno?: number } }).original?.errno;
      if (i >= attempts || !errno || !RETRYABLE.has(errno)) throw err;
      await new Promise((r) => setTimeout(r, 20 * i + Math.random() * 50));
    }
  }
}
