import type { Sequelize } from 'sequelize';
import { createIngestPool, type Pool } from './pool.ts';
import { createSequelize } from './sequelize.ts';

const owners = new WeakMap<Sequelize, Database>();

export type DatabaseOptions = {
  /** Connections of the Sequelize pool (models and most repositories). */
  poolMax?: number;
  /** Connections of the raw mariadb pool (streaming export, the readings store, rollups, leases). */
  rawPoolMax?: number;
};

/**
 * One process's way into the database: a Sequelize instance for models and ordinary queries,
 * and a raw mariadb pool on the same database for the work Sequelize cannot do well (streaming
 * rows out, multi-row prepared inserts, date strings as the readings store expects them).
 * The raw pool opens on first use; close() ends both, so neither is left holding connections.
 */
export class Database {
  readonly sequelize: Sequelize;
  private raw: Pool | undefined;
  private readonly rawPoolMax: number;

  constructor(readonly databaseUrl: string, opts: DatabaseOptions = {}) {
    this.sequelize = createSequelize(databaseUrl, opts.poolMax);
    this.rawPoolMax = opts.rawPoolMax ?? 4;
    owners.set(this.sequelize, this);
  }

  get pool(): Pool {
    this.raw ??= createIngestPool(this.databaseUrl, this.rawPoolMax);
    return this.raw;
  }

  async close(): Promise<void> {
    owners.delete(this.sequelize);
    const raw = this.raw;
    this.raw = undefined;
    await raw?.end().catch(() => undefined);
    await this.sequelize.close();
  }

  /** The Database a Sequelize instance belongs to (repositories find theirs through the models). */
  static of(sequelize: Sequelize): Database {
    const db = owners.get(sequelize);
    if (!db) throw new Error('This Sequelize instance was not opened through Database, so it has no raw pool');
    return db;
  }
}

/** The raw pool beside a Sequelize instance opened through Database. */
export const rawPool = (sequelize: Sequelize): Pool => Database.of(sequelize).pool;
