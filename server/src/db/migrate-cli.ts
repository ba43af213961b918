import { createMigrator } from './migrator.js';
import { scriptSequelize } from './cli-database.js';

const direction = process.argv[2] ?? 'up';
const sequelize = scriptSequelize();
try {
  const migrator = createMigrator(sequelize);
  if (direction === 'up') {
    const done = await migrator.up();
    console.log(done.length ? `Applied ${done.length} migration(s): ${done.map((m) => m.name).join(', ')}` : 'The database is up to date.');
  } else if (direction === 'down') {
    const undone = await migrator.down();
    console.log(undone.length ? `Undid ${undone.map((m) => m.name).join(', ')}` : 'Nothing to undo.');
  } else {
    console.error('Usage: migrate-cli.ts [up|down]');
    process.exitCode = 1;
  }
} catch (err) {
  console.error('Migration failed:', err);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
