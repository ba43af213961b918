import Stripe from 'stripe';
import {
  Dec,
  formatMoney,
  toMinorUnits,
  type CheckoutCreateInput,
  type CheckoutSyncDto,
} from '@wingstage/shared';
import { conflict, notFound } from '../errors/app-error.js';
import { inTransaction } from '../db/transaction.js';
import { DepositRequest, Invoice, Payment, Workshop } from '../models/index.js';
import { recordAudit } from '../services/audit.js';
import type { Deps } from '../services/deps.js';
import { findJob, lockJob } from '../services/job-access.js';
import type { Scope } from '../services/scope.js';
import { depositDto, lockPayment, paymentDto, processorTrouble, recordDeclined, recordExpired, recordSucceeded } from './card-payments.js';
import { jobMoney } from './job-balance.js';
import { stripeClient } from './stripe-client.js';

/** Where the payment page sends the owner back: a page that asks the server, never one that trusts the address. */
export function returnUrls(appUrl: string, jobId: string) {
  const base = appUrl.replace(/\/$/, '');
  return {
    success: `${base}/my-aircraft/payment?job=${jobId}&session={CHECKOUT_SESSION_ID}`,
    cancel: `${base}/my-aircraft?job=${jobId}`,
  };
}

/**
 * Opens a payment page (Checkout Session) for the owner of the job: a waiting deposit, or the
 * invoice's balance (jobMoney's due). A pending payment row is written with the session in the same
 * transaction, under the job's lock, so a refused or failed call leaves nothing behind. Each call
 * opens a page of its own (two tabs are two pages); only one can take the deposit's money, because
 * the first paid closes the others and a second paid one is handed back.
 */
export async function openCheckout(deps: Deps, scope: Scope, jobId: string, input: CheckoutCreateInput): Promise<{ url: string; paymentId: string }> {
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    const workshop = await Workshop.findByPk(scope.workshopId, { attributes: ['id', 'name', 'currency'], transaction: t });
    const currency = workshop!.currency;
    let amount: string;
    let depositRequestId: string | null = null;
    let invoiceId: string | null = null;
    let label: string;
    let description: string;
    if (input.for === 'deposit') {
      const deposit = await DepositRequest.findOne({ where: { id: input.depositRequestId, jobId: job.id, workshopId: scope.workshopId }, transaction: t, lock: t.LOCK.UPDATE });
      if (!deposit) throw notFound('That deposit');
      if (deposit.state === 'paid') throw conflict('This deposit has already been paid. There is nothing more to pay for it.');
      if (deposit.state === 'cancelled') throw conflict('The workshop cancelled this deposit, so there is nothing to pay for it.');
      amount = deposit.amount;
      depositRequestId = deposit.id;
      label = `Deposit for ${job.aircraft.registration} (job ${job.number})`;
      description = deposit.reason;
    } else {
      const invoice = await Invoice.findOne({ where: { jobId: job.id }, transaction: t });
      if (!invoice) throw conflict('There is no invoice for this job yet, so there is no balance to pay.');
      const money = await jobMoney(job.id, invoice.currency, t);
      if (money.due === null || !new Dec(money.due).greaterThan(0)) throw conflict('Nothing is left to pay on this job.');
      amount = money.due;
      invoiceId = invoice.id;
      label = `Balance of invoice ${invoice.number} for ${job.aircraft.registration}`;
      description = `Job ${job.number}`;
    }
    const payment = await Payment.create(
      { workshopId: scope.workshopId, jobId: job.id, kind: input.for, method: 'card', depositRequestId, invoiceId, currency, expectedAmount: amount, state: 'pending', recordedBy: scope.userId },
      { transaction: t },
    );
    const urls = returnUrls(deps.config.APP_URL, job.id);
    const metadata = { payment_id: payment.id, job_id: job.id, workshop_id: scope.workshopId, kind: input.for, ...(depositRequestId ? { deposit_request_id: depositRequestId } : {}) };
    let session: Stripe.Checkout.Session;
    try {
      session = await stripeClient(deps.config).checkout.sessions.create(
        {
          mode: 'payment',
          success_url: urls.success,
          cancel_url: urls.cancel,
          client_reference_id: payment.id,
          metadata,
          payment_intent_data: { metadata, description: `${label} — ${workshop!.name}` },
          line_items: [{ quantity: 1, price_data: { currency: currency.toLowerCase(), unit_amount: toMinorUnits(amount, currency), product_data: { name: label, description } } }],
        },
        { idempotencyKey: `checkout-${payment.id}` },
      );
    } catch (err) {
      throw processorTrouble(err);
    }
    if (!session.url) throw processorTrouble(new Error('the payment page has no address'));
    await payment.update({ stripeCheckoutSessionId: session.id }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'payment.page_opened',
      summary: `Card payment page opened for the ${input.for} of ${formatMoney(amount, currency)}`,
      detail: { paymentId: payment.id, session: session.id, depositRequestId, invoiceId },
    });
    return { url: session.url, paymentId: payment.id };
  });
}

/**
 * The owner is back from the payment page: read the session through the processor and record what
 * it says (paid, declined, closed). The page shows paid only when this answer says so.
 */
export async function syncCheckout(deps: Deps, scope: Scope, jobId: string, sessionId: string): Promise<CheckoutSyncDto> {
  const job = await findJob(scope, jobId);
  const known = await Payment.findOne({ where: { stripeCheckoutSessionId: sessionId, jobId: job.id, workshopId: scope.workshopId } });
  if (!known) throw notFound('That payment');
  let session: Stripe.Checkout.Session;
  try {
    session = await stripeClient(deps.config).checkout.sessions.retrieve(sessionId, { expand: ['payment_intent.latest_charge.balance_transaction'] });
  } catch (err) {
    throw processorTrouble(err);
  }
  return inTransaction(async (t) => {
    await lockJob(scope, jobId, t);
    const payment = await lockPayment(known.id, t);
    const pi = typeof session.payment_intent === 'object' ? session.payment_intent : null;
    if (session.status === 'complete' && session.payment_status === 'paid' && pi) await recordSucceeded(deps, payment, pi, t);
    else if (session.status === 'expired') await recordExpired(payment, t);
    else if (session.status === 'open' && pi?.last_payment_error) await recordDeclined(payment, pi, t);
    await payment.reload({ transaction: t });
    let deposit = null;
    if (payment.depositRequestId) {
      const d = await DepositRequest.findByPk(payment.depositRequestId, { transaction: t });
      const payments = await Payment.findAll({ where: { depositRequestId: payment.depositRequestId }, transaction: t });
      deposit = d ? depositDto(d, payments) : null;
    }
    return {
      payment: paymentDto(payment),
      deposit,
      declined: session.status === 'open' && payment.state === 'failed' ? payment.failureMessage : null,
    };
  });
}
