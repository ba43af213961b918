import type Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { formatMoney, fromMinorUnits, toMinorUnits } from '../../shared/src/index.js';
import { AuditEvent, DepositRequest, Payment, type User, type Workshop } from '../../server/src/models/index.js';
import type { SeededJob } from './demo-estimates.js';

const HOUR = 3_600_000;

/**
 * The demo's deposits: one paid by card on the Q-SALT re-cover (taken through the SDK from the
 * processor at seed time, so it exists there too, with its fee, net and balance transaction, and a
 * later payout can gather it), and one still waiting on the Q-BRKE engine service. Without a
 * processor (no key or no fake running) only the waiting one is seeded. Invented amounts.
 */
export async function seedDeposits(w: Workshop, seeded: SeededJob[], staff: Map<string, User>, now: Date, t: Transaction, stripe: Stripe | null): Promise<void> {
  const manager = staff.get('declan')!;
  const recover = seeded.find((j) => j.registration === 'Q-SALT' && j.job.title === 'Wing strip inspection and re-cover');
  const service = seeded.find((j) => j.registration === 'Q-BRKE' && j.job.title === '100-hour engine service');
  const currency = w.currency;

  if (service) {
    const at = new Date(now.getTime() - 20 * HOUR);
    const d = await DepositRequest.create(
      { workshopId: w.id, jobId: service.job.id, origin: 'manual', reason: 'Spark plugs, oil filter and a carburettor kit ordered', amount: '85.00', currency, vatMix: [{ rate: '20', gross: '85.00' }], createdBy: manager.id, createdAt: at, updatedAt: at },
      { transaction: t },
    );
    await AuditEvent.create(
      { workshopId: w.id, jobId: service.job.id, actorUserId: manager.id, action: 'deposit.requested', summary: `Deposit of ${formatMoney(d.amount, currency)} requested: ${d.reason}`, detail: { depositRequestId: d.id, origin: 'manual' }, at },
      { transaction: t },
    );
  }

  if (recover && stripe) {
    const asked = new Date(now.getTime() - 6 * 24 * HOUR);
    const d = await DepositRequest.create(
      { workshopId: w.id, jobId: recover.job.id, origin: 'manual', reason: 'Fabric, tapes and dope ordered for the re-cover', amount: '300.00', currency, vatMix: [{ rate: '20', gross: '300.00' }], createdBy: manager.id, createdAt: asked, updatedAt: asked },
      { transaction: t },
    );
    const payment = await Payment.create(
      { workshopId: w.id, jobId: recover.job.id, kind: 'deposit', method: 'card', depositRequestId: d.id, currency, expectedAmount: d.amount, state: 'pending' },
      { transaction: t },
    );
    let pi: Stripe.PaymentIntent;
    try {
      const metadata = { payment_id: payment.id, job_id: recover.job.id, workshop_id: w.id, kind: 'deposit', deposit_request_id: d.id };
      pi = await stripe.paymentIntents.create(
        { amount: toMinorUnits(d.amount, currency), currency: currency.toLowerCase(), payment_method: 'pm_card_visa', confirm: true, metadata, description: `Deposit for ${recover.registration} (job ${recover.job.number})`, expand: ['latest_charge.balance_transaction'] },
        { idempotencyKey: `demo-deposit-${payment.id}` },
      );
    } catch (err) {
      console.warn(`The demo's paid deposit was left out: the card processor did not answer (${err instanceof Error ? err.message : String(err)}).`);
      await payment.destroy({ transaction: t });
      await d.destroy({ transaction: t });
      return;
    }
    const charge = pi.latest_charge as Stripe.Charge;
    const bt = charge.balance_transaction as Stripe.BalanceTransaction;
    const paidAt = new Date(asked.getTime() + 5 * HOUR);
    const amount = fromMinorUnits(pi.amount_received, currency);
    const fee = fromMinorUnits(bt.fee, currency);
    const net = fromMinorUnits(bt.net, currency);
    await payment.update(
      { state: 'succeeded', amount, fee, net, stripePaymentIntentId: pi.id, stripeChargeId: charge.id, stripeBalanceTransactionId: bt.id, receivedAt: paidAt },
      { transaction: t },
    );
    await d.update({ state: 'paid', paidAt }, { transaction: t });
    const entries = [
      { at: asked, actorUserId: manager.id, action: 'deposit.requested', summary: `Deposit of ${formatMoney(d.amount, currency)} requested: ${d.reason}` },
      { at: paidAt, actorUserId: null, action: 'payment.received', summary: `Deposit of ${formatMoney(amount, currency)} received by card (fee ${formatMoney(fee, currency)}, net ${formatMoney(net, currency)})` },
      { at: paidAt, actorUserId: null, action: 'deposit.paid', summary: `Deposit paid: ${d.reason} (${formatMoney(d.amount, currency)})` },
    ];
    for (const e of entries) {
      await AuditEvent.create({ workshopId: w.id, jobId: recover.job.id, ...e, detail: { depositRequestId: d.id, paymentId: payment.id } }, { transaction: t });
    }
  }
}
