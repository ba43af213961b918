import type Stripe from 'stripe';
import { Dec, assertPaymentMove, formatAmount, formatMoney, fromMinorUnits, minorUnits, type PaymentState } from '@wingstage/shared';
import { AuditEvent, Payment, Refund } from '../../models/index.js';
import { lockJobById } from '../../services/job-access.js';
import type { PaymentEventHandlers } from '../../services/payment-events.service.js';

/**
 * `charge.refunded`: the processor says how much of a charge is now refunded. The payment is
 * brought up to that figure (never down: a late event for an earlier refund changes nothing) and
 * its refunds recorded through Wingstage are marked succeeded. Money refunded outside Wingstage
 * (from the processor's own dashboard) is recorded on the payment and put in the job's history,
 * since it still needs its credit note.
 */
export const REFUND_EVENT_HANDLERS: PaymentEventHandlers = {
  'charge.refunded': async (event, { transaction: t }) => {
    const charge = event.data.object as Stripe.Charge;
    const intent = typeof charge.payment_intent === 'string' ? charge.payment_intent : (charge.payment_intent?.id ?? null);
    const where = intent ? { stripePaymentIntentId: intent } : { stripeChargeId: charge.id };
    const found = await Payment.findOne({ where, attributes: ['id', 'jobId'], transaction: t });
    if (!found) return;
    // Lock order: the job first, then its payment.
    await lockJobById(found.jobId, t);
    const payment = await Payment.findByPk(found.id, { transaction: t, lock: t.LOCK.UPDATE });
    if (!payment || payment.amount === null) return;
    const currency = payment.currency;
    const refundedNow = new Dec(fromMinorUnits(charge.amount_refunded, currency));
    const dp = minorUnits(currency);
    await Refund.update({ state: 'succeeded' }, { where: { paymentId: payment.id, state: 'pending' }, transaction: t });
    if (!refundedNow.greaterThan(payment.refunded)) return { workshopId: payment.workshopId };
    const outside = refundedNow.minus(payment.refunded);
    const to: PaymentState = refundedNow.greaterThanOrEqualTo(payment.amount) ? 'refunded' : 'partially_refunded';
    if (payment.state !== to) assertPaymentMove(payment.state, to);
    await payment.update({ refunded: formatAmount(refundedNow, dp), state: to, stripeChargeId: payment.stripeChargeId ?? charge.id }, { transaction: t });
    await AuditEvent.create(
      {
        workshopId: payment.workshopId,
        jobId: payment.jobId,
        actorUserId: null,
        action: 'payment.refunded_outside',
        summary: `The card processor reports ${formatMoney(formatAmount(outside, dp), currency)} refunded on a card payment outside Wingstage; issue a credit note for it`,
        detail: { paymentId: payment.id, chargeId: charge.id, refunded: formatAmount(refundedNow, dp) },
      },
      { transaction: t },
    );
    return { workshopId: payment.workshopId };
  },
};
