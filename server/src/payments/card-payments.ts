import Stripe from 'stripe';
import { Op, type Transaction } from 'sequelize';
import {
  Dec,
  assertDepositRequestMove,
  assertPaymentMove,
  formatMoney,
  fromMinorUnits,
  type DepositRequestDto,
  type PaymentDto,
} from '@wingstage/shared';
import { AppError } from '../errors/app-error.js';
import { AuditEvent, DepositRequest, Payment, Refund } from '../models/index.js';
import type { Deps } from '../services/deps.js';
import { queuePaymentReceipt } from '../jobs/payment-receipts.js';
import { settleJobIfCovered } from './job-balance.js';
import { stripeClient } from './stripe-client.js';

/**
 * Card payments after the payment page: one place that turns what the processor says (read back
 * through the SDK, never taken from a return address or an event body alone) into payment and
 * deposit rows. Called by the webhook handlers and by the owner's return, inside a transaction that
 * has already locked the job (lock order: job, deposit request, payments).
 */

/** The processor could not be reached or refused the call: nothing is written, the person may try again. */
export function processorTrouble(err: unknown): AppError {
  if (err instanceof AppError) return err;
  const message = err instanceof Error ? err.message : String(err);
  return new AppError('unavailable', 503, `The card payment service did not answer as expected, so nothing was charged or saved. Please try again in a minute. (${message.slice(0, 200)})`, undefined, 5);
}

/** A history entry written by Wingstage itself (no person acted: the processor told us). */
export async function recordAppAudit(t: Transaction, e: { workshopId: string; jobId: string; action: string; summary: string; detail?: Record<string, unknown> }): Promise<void> {
  await AuditEvent.create({ workshopId: e.workshopId, jobId: e.jobId, actorUserId: null, action: e.action, summary: e.summary, detail: e.detail ?? {} }, { transaction: t });
}

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);
const money = (amount: string, currency: string) => formatMoney(amount, currency);
const what = (p: Payment) => (p.kind === 'deposit' ? 'deposit' : 'balance');

export function paymentDto(p: Payment): PaymentDto {
  return {
    id: p.id,
    jobId: p.jobId,
    kind: p.kind,
    method: p.method,
    state: p.state,
    depositRequestId: p.depositRequestId ?? null,
    invoiceId: p.invoiceId ?? null,
    currency: p.currency,
    expectedAmount: p.expectedAmount,
    amount: p.amount ?? null,
    fee: p.fee ?? null,
    net: p.net ?? null,
    refunded: p.refunded,
    amountMismatch: p.amountMismatch,
    failureMessage: p.failureMessage ?? null,
    outcomeNote: p.outcomeNote ?? null,
    receivedAt: iso(p.receivedAt),
    createdAt: p.createdAt.toISOString(),
  };
}

export function depositDto(d: DepositRequest, payments: Payment[]): DepositRequestDto {
  const own = payments.filter((p) => p.depositRequestId === d.id).sort((a, b) => b.createdAt.getTime() - a.createdAt.getTime());
  const latest = own[0];
  return {
    id: d.id,
    jobId: d.jobId,
    origin: d.origin,
    reason: d.reason,
    amount: d.amount,
    currency: d.currency,
    state: d.state,
    createdAt: d.createdAt.toISOString(),
    paidAt: iso(d.paidAt),
    cancelledAt: iso(d.cancelledAt),
    cancelReason: d.cancelReason ?? null,
    version: d.version,
    payments: own.map(paymentDto),
    lastDecline: d.state === 'waiting' && latest?.state === 'failed' ? latest.failureMessage ?? 'The card was declined.' : null,
  };
}

/** The payment a processor object belongs to: by the id we stored, else by the payment id we put in its metadata. */
export async function findPaymentFor(ids: { sessionId?: string | null; paymentIntentId?: string | null; metadata?: Stripe.Metadata | null }, t: Transaction): Promise<Payment | null> {
  if (ids.sessionId) {
    const p = await Payment.findOne({ where: { stripeCheckoutSessionId: ids.sessionId }, transaction: t });
    if (p) return p;
  }
  if (ids.paymentIntentId) {
    const p = await Payment.findOne({ where: { stripePaymentIntentId: ids.paymentIntentId }, transaction: t });
    if (p) return p;
  }
  const id = ids.metadata?.payment_id;
  if (id && /^[0-9a-f-]{36}$/.test(id)) return Payment.findByPk(id, { transaction: t });
  return null;
}

/** Re-reads a payment under lock (call after the job row is locked). */
export async function lockPayment(id: string, t: Transaction): Promise<Payment> {
  const p = await Payment.findByPk(id, { transaction: t, lock: t.LOCK.UPDATE });
  if (!p) throw new Error(`payment ${id} vanished inside its transaction`);
  return p;
}

/** The payment intent with its charge and the charge's balance transaction (fee and net). */
export async function readPaymentIntent(deps: Deps, id: string): Promise<Stripe.PaymentIntent> {
  return stripeClient(deps.config).paymentIntents.retrieve(id, { expand: ['latest_charge.balance_transaction'] });
}

/**
 * The processor says the money was taken: record gross, fee and net from the balance transaction,
 * flag an amount that differs from what was asked, settle the deposit (or the invoice), close the
 * other payment pages for the same deposit, and hand back a second payment for a deposit already
 * paid or cancelled. Idempotent: a payment already settled is left as it is.
 */
export async function recordSucceeded(deps: Deps, payment: Payment, pi: Stripe.PaymentIntent, t: Transaction): Promise<void> {
  if (pi.status !== 'succeeded') return;
  if (payment.state !== 'pending' && payment.state !== 'failed') return;
  const charge = typeof pi.latest_charge === 'object' && pi.latest_charge ? pi.latest_charge : null;
  const bt = charge && typeof charge.balance_transaction === 'object' && charge.balance_transaction ? charge.balance_transaction : null;
  if (!charge || !bt) throw new Error(`payment intent ${pi.id} was read without its charge and balance transaction`);
  const currency = payment.currency;
  const sameCurrency = pi.currency.toUpperCase() === currency && bt.currency.toUpperCase() === currency;
  const amount = fromMinorUnits(pi.amount_received, currency);
  const fee = fromMinorUnits(bt.fee, currency);
  const net = fromMinorUnits(bt.net, currency);
  const mismatch = !sameCurrency || !new Dec(amount).equals(new Dec(payment.expectedAmount));
  assertPaymentMove(payment.state, 'succeeded');
  await payment.update(
    {
      state: 'succeeded',
      amount,
      fee,
      net,
      amountMismatch: mismatch,
      stripePaymentIntentId: pi.id,
      stripeChargeId: charge.id,
      stripeBalanceTransactionId: bt.id,
      receivedAt: new Date(charge.created * 1000),
      outcomeNote: mismatch
        ? `Received ${sameCurrency ? money(amount, currency) : `${pi.amount_received} minor units of ${pi.currency.toUpperCase()}`} against ${money(payment.expectedAmount, currency)} asked: kept and flagged for accounts to check.`
        : payment.outcomeNote,
    },
    { transaction: t },
  );
  const base = { workshopId: payment.workshopId, jobId: payment.jobId };
  await recordAppAudit(t, {
    ...base,
    action: 'payment.received',
    summary: `${what(payment) === 'deposit' ? 'Deposit' : 'Balance'} of ${money(amount, currency)} received by card (fee ${money(fee, currency)}, net ${money(net, currency)})`,
    detail: { paymentId: payment.id, paymentIntent: pi.id, charge: charge.id, balanceTransaction: bt.id, amount, fee, net },
  });
  if (mismatch) {
    await recordAppAudit(t, {
      ...base,
      action: 'payment.amount_mismatch',
      summary: `Card payment of ${money(amount, currency)} does not match the ${money(payment.expectedAmount, currency)} asked: flagged for accounts`,
      detail: { paymentId: payment.id, expected: payment.expectedAmount, received: amount, currency: pi.currency },
    });
  }

  if (payment.kind === 'balance') {
    await settleJobIfCovered(null, payment.jobId, t);
    await queuePaymentReceipt(deps, payment.id, t);
    return;
  }

  const deposit = await DepositRequest.findByPk(payment.depositRequestId!, { transaction: t, lock: t.LOCK.UPDATE });
  if (!deposit) throw new Error(`deposit request of payment ${payment.id} is missing`);
  if (deposit.state !== 'waiting') {
    await refundSecondPayment(deps, payment, deposit, pi, t);
    return;
  }
  if (mismatch) {
    // Kept and flagged; the deposit stays waiting until accounts sort it out. The money was received: the owner gets a receipt.
    await queuePaymentReceipt(deps, payment.id, t);
    return;
  }
  assertDepositRequestMove(deposit.state, 'paid');
  await deposit.update({ state: 'paid', paidAt: payment.receivedAt }, { transaction: t });
  await recordAppAudit(t, { ...base, action: 'deposit.paid', summary: `Deposit paid: ${deposit.reason} (${money(deposit.amount, deposit.currency)})`, detail: { depositRequestId: deposit.id, paymentId: payment.id } });
  await closeOtherPages(deps, deposit, payment, t);
  // One e-mail per payment: the receipt, with its PDF, rendered by a task after this commits.
  await queuePaymentReceipt(deps, payment.id, t);
}

/**
 * Every other open payment page for this deposit is expired through the processor and its payment
 * cancelled with the reason. A page that was paid meanwhile cannot be expired: its own event then
 * finds the deposit paid and hands the money back.
 */
async function closeOtherPages(deps: Deps, deposit: DepositRequest, paid: Payment, t: Transaction): Promise<void> {
  const others = await Payment.findAll({
    where: { depositRequestId: deposit.id, id: { [Op.ne]: paid.id }, state: ['pending', 'failed'] },
    order: [['createdAt', 'ASC']],
    transaction: t,
    lock: t.LOCK.UPDATE,
  });
  for (const other of others) {
    const closed = await expireSession(deps, other.stripeCheckoutSessionId);
    if (!closed) continue;
    assertPaymentMove(other.state, 'cancelled');
    await other.update({ state: 'cancelled', outcomeNote: `Payment page closed unpaid: the deposit was paid through another payment page (payment ${paid.id.slice(0, 8)}).` }, { transaction: t });
  }
}

/**
 * Expires a payment page if it is still open. True when it is now closed without payment (expired
 * by this call or before); false when it was paid, so it must not be marked cancelled.
 */
export async function expireSession(deps: Deps, sessionId: string | null | undefined): Promise<boolean> {
  if (!sessionId) return true;
  const sdk = stripeClient(deps.config);
  try {
    const s = await sdk.checkout.sessions.expire(sessionId, {}, { idempotencyKey: `expire-${sessionId}` });
    return s.status === 'expired';
  } catch (err) {
    if (!(err instanceof Stripe.errors.StripeInvalidRequestError)) throw err;
    const s = await sdk.checkout.sessions.retrieve(sessionId);
    return s.status === 'expired';
  }
}

/** A second payment for a deposit already paid (two tabs), or for one cancelled meanwhile: returned in full at once. */
async function refundSecondPayment(deps: Deps, payment: Payment, deposit: DepositRequest, pi: Stripe.PaymentIntent, t: Transaction): Promise<void> {
  const reason =
    deposit.state === 'paid'
      ? 'Second payment for a deposit that was already paid (two payment pages were open): returned in full.'
      : 'Payment arrived after the deposit was cancelled: returned in full.';
  const refund = await stripeClient(deps.config).refunds.create(
    { payment_intent: pi.id, reason: 'duplicate', metadata: { payment_id: payment.id, deposit_request_id: deposit.id } },
    { idempotencyKey: `second-payment-${payment.id}` },
  );
  const amount = payment.amount!;
  await Refund.create(
    {
      workshopId: payment.workshopId,
      jobId: payment.jobId,
      paymentId: payment.id,
      amount: fromMinorUnits(refund.amount, payment.currency),
      currency: payment.currency,
      state: refund.status === 'succeeded' ? 'succeeded' : refund.status === 'failed' ? 'failed' : 'pending',
      reason,
      stripeRefundId: refund.id,
      stripeBalanceTransactionId: typeof refund.balance_transaction === 'string' ? refund.balance_transaction : (refund.balance_transaction?.id ?? null),
    },
    { transaction: t },
  );
  assertPaymentMove(payment.state, 'refunded');
  await payment.update({ state: 'refunded', refunded: amount, outcomeNote: reason }, { transaction: t });
  await recordAppAudit(t, {
    workshopId: payment.workshopId,
    jobId: payment.jobId,
    action: 'payment.refunded',
    summary: `Card payment of ${money(amount, payment.currency)} refunded in full: ${reason}`,
    detail: { paymentId: payment.id, refund: refund.id, depositRequestId: deposit.id },
  });
}

/** The card was declined on the payment page: the owner may try again on the same page or a new one. */
export async function recordDeclined(payment: Payment, pi: Stripe.PaymentIntent, t: Transaction): Promise<void> {
  const err = pi.last_payment_error;
  if (!err) return;
  if (payment.state !== 'pending' && payment.state !== 'failed') return;
  // A decline already recorded (a replay, or the return page and the webhook both) adds nothing.
  const chargeId = typeof pi.latest_charge === 'string' ? pi.latest_charge : (pi.latest_charge?.id ?? null);
  if (payment.state === 'failed' && chargeId && payment.stripeChargeId === chargeId) return;
  if (payment.state === 'pending') assertPaymentMove(payment.state, 'failed');
  const message = err.message ?? 'The card was declined.';
  await payment.update(
    { state: 'failed', failureCode: err.decline_code ?? err.code ?? null, failureMessage: message, stripePaymentIntentId: pi.id, stripeChargeId: chargeId },
    { transaction: t },
  );
  await recordAppAudit(t, {
    workshopId: payment.workshopId,
    jobId: payment.jobId,
    action: 'payment.declined',
    summary: `Card declined for the ${what(payment)} of ${money(payment.expectedAmount, payment.currency)}: ${message}`,
    detail: { paymentId: payment.id, paymentIntent: pi.id, code: err.code ?? null, declineCode: err.decline_code ?? null },
  });
}

/** The payment page closed unpaid (it expired, or Wingstage closed it). */
export async function recordExpired(payment: Payment, t: Transaction): Promise<void> {
  if (payment.state !== 'pending' && payment.state !== 'failed') return;
  assertPaymentMove(payment.state, 'cancelled');
  await payment.update({ state: 'cancelled', outcomeNote: payment.outcomeNote ?? 'Payment page closed unpaid: it expired before a card was accepted.' }, { transaction: t });
  await recordAppAudit(t, {
    workshopId: payment.workshopId,
    jobId: payment.jobId,
    action: 'payment.closed',
    summary: `Card payment page for the ${what(payment)} of ${money(payment.expectedAmount, payment.currency)} closed unpaid`,
    detail: { paymentId: payment.id, session: payment.stripeCheckoutSessionId },
  });
}
