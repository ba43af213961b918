import type Stripe from 'stripe';
import type { PaymentEventHandlers } from '../../services/payment-events.service.js';
import { lockJobById } from '../../services/job-access.js';
import { findPaymentFor, lockPayment, readPaymentIntent, recordDeclined, recordExpired, recordSucceeded } from '../card-payments.js';

/**
 * Checkout and payment-intent events: settle the payment a session or intent belongs to (deposits
 * and balances). Each handler runs inside the transaction that records the event. The event only
 * says which payment to look at; what happened is read back from the processor, so an event that
 * arrives twice, late or out of order still ends in the right state. Objects Wingstage did not
 * open (no payment row) are acknowledged and left alone.
 */
const idOf = (v: string | { id: string } | null | undefined) => (typeof v === 'string' ? v : (v?.id ?? null));

export const CHECKOUT_EVENT_HANDLERS: PaymentEventHandlers = {
  'checkout.session.completed': async (event, { deps, transaction: t }) => {
    const session = event.data.object as Stripe.Checkout.Session;
    const found = await findPaymentFor({ sessionId: session.id, metadata: session.metadata }, t);
    if (!found) return { workshopId: null };
    await lockJobById(found.jobId, t);
    const payment = await lockPayment(found.id, t);
    const piId = idOf(session.payment_intent);
    if (session.payment_status === 'paid' && piId) await recordSucceeded(deps, payment, await readPaymentIntent(deps, piId), t);
    return { workshopId: payment.workshopId };
  },
  'payment_intent.succeeded': async (event, { deps, transaction: t }) => {
    const pi = event.data.object as Stripe.PaymentIntent;
    const found = await findPaymentFor({ paymentIntentId: pi.id, metadata: pi.metadata }, t);
    if (!found) return { workshopId: null };
    await lockJobById(found.jobId, t);
    const payment = await lockPayment(found.id, t);
    await recordSucceeded(deps, payment, await readPaymentIntent(deps, pi.id), t);
    return { workshopId: payment.workshopId };
  },
  'payment_intent.payment_failed': async (event, { deps, transaction: t }) => {
    const pi = event.data.object as Stripe.PaymentIntent;
    const found = await findPaymentFor({ paymentIntentId: pi.id, metadata: pi.metadata }, t);
    if (!found) return { workshopId: null };
    await lockJobById(found.jobId, t);
    const payment = await lockPayment(found.id, t);
    // Read back: a later attempt on the same page may already have succeeded.
    const now = await readPaymentIntent(deps, pi.id);
    if (now.status === 'succeeded') await recordSucceeded(deps, payment, now, t);
    else await recordDeclined(payment, pi, t);
    return { workshopId: payment.workshopId };
  },
  'checkout.session.expired': async (event, { transaction: t }) => {
    const session = event.data.object as Stripe.Checkout.Session;
    const found = await findPaymentFor({ sessionId: session.id, metadata: session.metadata }, t);
    if (!found) return { workshopId: null };
    await lockJobById(found.jobId, t);
    const payment = await lockPayment(found.id, t);
    await recordExpired(payment, t);
    return { workshopId: payment.workshopId };
  },
};
