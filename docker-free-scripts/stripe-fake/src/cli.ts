/**
 * The fake as a process for `npm start` / `npm test` (docker-free-scripts/stripe-fake.sh):
 *   STRIPE_SECRET_KEY (sk_test_… only)  WS_STRIPE_PORT (default 12111)
 *   STRIPE_WEBHOOK_SECRET + WS_STRIPE_WEBHOOK_URL: where signed events go (both, or no delivery)
 *   WS_STRIPE_FEE_BPS / WS_STRIPE_FEE_FIXED: the card fee (default 150 bp + 20 minor units)
 */
import { startStripeFake } from './index.js';

function whole(name: string, fallback: number): number {
  const v = process.env[name];
  if (v === undefined || v === '') return fallback;
  if (!/^\d{1,9}$/.test(v)) {
    console.error(`[stripe-fake] ${name} must be a whole number, not "${v}"`);
    process.exit(2);
  }
  return Number(v);
}

try {
  const fake = await startStripeFake({
    apiKey: process.env.STRIPE_SECRET_KEY ?? '',
    port: whole('WS_STRIPE_PORT', 12111),
    webhookUrl: process.env.WS_STRIPE_WEBHOOK_URL || null,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET || null,
    fee: { percentBasisPoints: whole('WS_STRIPE_FEE_BPS', 150), fixed: whole('WS_STRIPE_FEE_FIXED', 20) },
  });
  console.log(`[stripe-fake] listening on ${fake.url}; webhooks ${process.env.WS_STRIPE_WEBHOOK_URL && process.env.STRIPE_WEBHOOK_SECRET ? `to ${process.env.WS_STRIPE_WEBHOOK_URL}` : 'off'}`);
  const stop = () => {
    void fake.stop().then(() => process.exit(0));
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
} catch (err) {
  console.error(`[stripe-fake] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
}
