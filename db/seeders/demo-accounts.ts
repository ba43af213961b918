import type Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { Dec } from '../../shared/src/index.js';
import { AuditEvent, DepositRequest, Payment, type User, type Workshop } from '../../server/src/models/index.js';
import { createStripeClient } from '../../server/src/payments/stripe-client.js';
import type { SeededJob } from './demo-estimates.js';

const day = 86_400_000;

/** The local fake the demo app talks to, when the seed runs beside it (npm start, npm test). */
function demoStripe(): Stripe | null {
  const key = process.env.STRIPE_SECRET_KEY;
  const url = process.env.STRIPE_API_URL;
  if (!key || !url) return null;
  const u = new URL(url);
  return createStripeClient({ STRIPE_SECRET_KEY: key, NODE_ENV: 'test', stripeApi: { host: u.hostname, port: Number(u.port), protocol: u.protocol === 'https:' ? 'https' : 'http' } });
}

/** A card payment confirmed in the fake (so its balance transaction and a payout run are real). */
async function viaFake(stripe: Stripe | null, amount: string): Promise<Partial<Payment> & { fee: string; net: string }> {
  const minor = new Dec(amount).times(100).toNumber();
  if (stripe) {
    try {
      const pi = await stripe.paymentIntents.create({ amount: minor, currency: 'gbp', payment_method: 'pm_card_visa', confirm: true });
      const charge = await stripe.charges.retrieve(pi.latest_charge as string);
      const bt = await stripe.balanceTransactions.retrieve(charge.balance_transaction as string);
      return { stripePaymentIntentId: pi.id, stripeChargeId: charge.id, stripeBalanceTransactionId: bt.id, fee: (bt.fee / 100).toFixed(2), net: (bt.net / 100).toFixed(2) };
    } catch {
      // No fake running (a seed test without one): the rows are planted without processor objects.
    }
  }
  // The UK standard card fee the fake charges: 1.5 % half-up + 20p [common practice; values as the fake uses them].
  const feeMinor = new Dec(minor).times('0.015').toDecimalPlaces(0, Dec.ROUND_HALF_UP).plus(20);
  return { fee: feeMinor.dividedBy(100).toFixed(2), net: new Dec(minor).minus(feeMinor).dividedBy(100).toFixed(2) };
}

/**
 * Accounts in the demo, beside the invoices and deposits the other seeders make: a deposit paid by
 * card that came in short of what was asked — the one planted exception. It is real in the local
 * fake, whose clock is then moved past the card money's two pending days, so a payout run pays out
 * this and the other seeded card payments.
 */
export async function seedAccounts(w: Workshop, jobs: SeededJob[], staff: Map<string, User>, now: Date, t: Transaction): Promise<void> {
  const depositJob = jobs.find((j) => j.registration === 'Q-BRKA' && j.job.title === 'Annual permit inspection');
  if (!depositJob) return;
  const stripe = demoStripe();

  // The planted exception: £300.00 asked as a deposit, £290.00 received.
  const dr = await DepositRequest.create(
    { workshopId: w.id, jobId: depositJob.job.id, origin: 'manual', reason: 'Propeller sent out for overhaul', amount: '300.00', currency: 'GBP', vatMix: [{ rate: '20', gross: '300.00' }], state: 'paid', paidAt: new Date(now.getTime() - 4 * day), createdBy: staff.get('declan')!.id },
    { transaction: t },
  );
  const p3 = await viaFake(stripe, '290.00');
  await Payment.create(
    { workshopId: w.id, jobId: depositJob.job.id, kind: 'deposit', method: 'card', depositRequestId: dr.id, state: 'succeeded', currency: 'GBP', expectedAmount: '300.00', amount: '290.00', ...p3, amountMismatch: true, receivedAt: new Date(now.getTime() - 4 * day) },
    { transaction: t },
  );
  await AuditEvent.create({ workshopId: w.id, jobId: depositJob.job.id, actorUserId: null, action: 'payment.received', summary: 'Deposit of £290.00 received by card (£300.00 was asked)', detail: { depositRequestId: dr.id }, at: new Date(now.getTime() - 4 * day) }, { transaction: t });

  // The fake holds card money for two days before a payout may take it.
  if (stripe) {
    try {
      const u = new URL(process.env.STRIPE_API_URL!);
      await fetch(`${u.origin}/control/clock`, { method: 'POST', headers: { Authorization: `Bearer ${process.env.STRIPE_SECRET_KEY}`, 'Content-Type': 'application/x-www-form-urlencoded' }, body: 'advance_seconds=172860' });
    } catch {
      // No fake: nothing to move.
    }
  }
}
