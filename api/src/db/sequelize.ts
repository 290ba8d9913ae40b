import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { logger } from '../lib/logger.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

/** One Sequelize instance per process; UTC everywhere (both settings are needed, see DEVELOPERS.md). */
export function createSequelize(databaseUrl: string, poolMax = 10): Sequelize {
  return new Sequelize(databaseUrl, {
    dialect: 'mariadb',
    logging: false,
    timezone: '+00:00',
    dialectOptions: {
      timezone: '+00:00',
      bigIntAsNumber: true,
      insertIdAsNumber: true,
      decimalAsNumber: true,
      checkNumberRange: true,
      connectTimeout: 5000,
    },
    pool: { max: poolMax, min: 0, idle: 10_000, acquire: 60_000 },
    define: { underscored: true },
  });
}

export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: {
      glob: ['migrations/*.ts', { cwd: root }],
      // Import from here rather than inside umzug so tsx and vitest both load the TypeScript files.
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => (await import(file!)).up({ context }),
        down: async () => (await import(file!)).down({ context }),
      }),
    },
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: { info: (m) => logger.debug(m), warn: (m) => logger.warn(m), error: (m) => logger.error(m), debug: () => {} },
  });
}
