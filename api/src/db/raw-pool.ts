import type { Sequelize } from 'sequelize';
import { createIngestPool, type Pool } from './pool.ts';

const pools = new WeakMap<Sequelize, Pool>();

/**
 * A raw mariadb pool on the same database as a Sequelize instance, for the two jobs Sequelize
 * cannot do: streaming rows out (CSV export) and the ingest store's statements, which expect
 * the ingest pool's date strings (historical import). Built lazily from Sequelize's own
 * settings so tests and the server need no extra wiring; closed together with Sequelize.
 */
export function rawPool(sequelize: Sequelize): Pool {
  const existing = pools.get(sequelize);
  if (existing) return existing;
  const c = sequelize.config;
  const url = new URL(`mariadb://${c.host ?? '127.0.0.1'}:${c.port ?? 3306}/${encodeURIComponent(c.database)}`);
  url.username = encodeURIComponent(c.username ?? '');
  url.password = encodeURIComponent(c.password ?? '');
  const pool = createIngestPool(url.href, 4);
  pools.set(sequelize, pool);
  const close = sequelize.close.bind(sequelize);
  sequelize.close = async () => {
    pools.delete(sequelize);
    await pool.end().catch(() => undefined);
    return close();
  };
  return pool;
}
