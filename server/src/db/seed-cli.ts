import { initModels } from '../models/index.js';
import { removeDemo, seedDemo } from '../../../db/seeders/demo.js';
import { scriptSequelize } from './cli-database.js';
import { createStripeClient } from '../payments/stripe-client.js';

const reset = process.argv.includes('--reset');

/** The card processor the demo's paid deposit is taken through (the local fake under npm start); none without a key. */
function demoStripe() {
  const key = process.env.STRIPE_SECRET_KEY;
  if (!key?.startsWith('sk_test_')) return null;
  const url = process.env.STRIPE_API_URL ? new URL(process.env.STRIPE_API_URL) : null;
  return createStripeClient({
    STRIPE_SECRET_KEY: key,
    NODE_ENV: 'test',
    stripeApi: url ? { host: url.hostname, port: Number(url.port || (url.protocol === 'https:' ? 443 : 80)), protocol: url.protocol === 'https:' ? 'https' : 'http' } : null,
  });
}
const sequelize = scriptSequelize();
try {
  initModels(sequelize);
  if (reset && (await removeDemo(sequelize))) console.log('Removed the demo workshop and everything in it.');
  const seeded = await seedDemo(sequelize, new Date(), undefined, demoStripe());
  console.log(seeded ? 'Seeded the demo workshop.' : 'The demo workshop is already there; nothing to do (use -- --reset to start it afresh).');
} catch (err) {
  console.error('Seeding failed:', err);
  process.exitCode = 1;
} finally {
  await sequelize.close();
}
