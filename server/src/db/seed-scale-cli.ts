import { initModels } from '../models/index.js';
import { findDemoWorkshop, seedDemo } from '../../../db/seeders/demo.js';
import { SCALE, scaleAlreadySeeded, seedScale } from '../../../db/seeders/scale.js';
import { scriptSequelize } from './cli-database.js';
import { migrateUp } from './migrator.js';

// npm run seed:scale: the benchmark's data set, in its own database (DATABASE_URL names it). Migrates,
// seeds the demo workshop (its sign-ins and settings), then adds a busy workshop's rows in bulk, once.
const began = Date.now();
const sequelize = scriptSequelize();
try {
  initModels(sequelize);
  await migrateUp(sequelize);
  await seedDemo(sequelize);
  const w = await findDemoWorkshop();
  if (!w) throw new Error('The demo workshop is missing after seeding.');
  if (await scaleAlreadySeeded(sequelize, w.id)) {
    console.log('The scale data set is already there; nothing to do.');
  } else {
    await seedScale(sequelize, w.id, (msg) => console.log(`  ${msg}`));
    console.log(
      `Seeded the scale data set: ${SCALE.jobs} jobs over ${SCALE.aircraft} aircraft, ${SCALE.lines} estimate lines, ` +
        `${SCALE.jobs * SCALE.findingsPerJob} findings with their requests and decisions, in ${((Date.now() - began) / 1000).toFixed(0)} s.`,
    );
  }
} catch (err) {
  console.error('Seeding the scale data set failed:', err);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
