/** Runs pending migrations against DATABASE_URL (forward only; `--down` undoes the last one). */
import { createMigrator, createSequelize } from '../api/src/db/sequelize.ts';

const url = process.env.DATABASE_URL;
if (!url) {
  process.stderr.write('DATABASE_URL is not set (npm start sets it for the private database)\n');
  process.exit(1);
}
const sequelize = createSequelize(url, 2);
try {
  const migrator = createMigrator(sequelize);
  const done = process.argv.includes('--down') ? await migrator.down() : await migrator.up();
  process.stdout.write(`migrations: ${done.length ? done.map((m) => m.name).join(', ') : 'up to date'}\n`);
} finally {
  await sequelize.close();
}
