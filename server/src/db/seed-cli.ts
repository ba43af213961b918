import { initModels } from '../models/index.js';
import { removeDemo, seedDemo } from '../../../db/seeders/demo.js';
import { scriptSequelize } from './cli-database.js';

const reset = process.argv.includes('--reset');
const sequelize = scriptSequelize();
try {
  initModels(sequelize);
  if (reset && (await removeDemo(sequelize))) console.log('Removed the demo workshop and everything in it.');
  const seeded = await seedDemo(sequelize);
  console.log(seeded ? 'Seeded the demo workshop.' : 'The demo workshop is already there; nothing to do (use -- --reset to start it afresh).');
} catch (err) {
  console.error('Seeding failed:', err);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
