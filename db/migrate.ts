// CLI: node --import tsx db/migrate.ts [up|down]
// Applies pending migrations (up, the default) or undoes the last one (down) on the database
// named by the RW_DB_* environment variables (see api/src/config.ts).
import { loadConfig } from '../api/src/config';
import { createSequelize } from '../api/src/db';
import { createMigrator } from './migrator';

const command = process.argv[2] ?? 'up';
if (command !== 'up' && command !== 'down') {
  console.error('Usage: node --import tsx db/migrate.ts [up|down]');
  process.exit(2);
}
const config = loadConfig();
const sequelize = createSequelize(config);
try {
  const migrator = createMigrator(sequelize);
  const done = command === 'up' ? await migrator.up() : await migrator.down();
  const names = done.map((m) => m.name).join(', ');
  console.log(
    command === 'up'
      ? names ? `Migrated ${config.RW_DB_NAME} up: ${names}.` : `${config.RW_DB_NAME} is up to date.`
      : names ? `Migrated ${config.RW_DB_NAME} down: ${names}.` : 'No migration to undo.',
  );
} catch (err) {
  console.error(`Migration failed: ${(err as Error).message}`);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
