import type Stripe from 'stripe';
import { cardFor, TEST_PAYMENT_METHODS } from './cards.js';
import { FakeError, invalid, noSuch, unexpectedState } from './errors.js';
import { cardFee, UK_STANDARD_CARD_FEE, type FeeSchedule } from './fees.js';
import { newId, PREFIX } from './ids.js';
import * as make from './objects.js';
import { WebhookDeliverer } from './webhooks.js';

export const API_VERSION = '2026-10-28.endive';
const DAY = 86_400;

export interface FakeOptions {
  /** The one secret key the fake accepts; it must be a test key (`sk_test_…`). */
  apiKey: string;
  /** Where signed events are posted; no URL, no delivery. */
  webhookUrl?: string | null;
  webhookSecret?: string | null;
  fee?: FeeSchedule;
  /** How long a charge's funds stay pending before a payout may gather them (default 2 days). */
  availableAfterSeconds?: number;
  /** Waits between webhook attempts (default 1 s, 5 s, 25 s: four attempts in all). */
  retryDelaysMs?: number[];
  webhookTimeoutMs?: number;
  /** A Checkout Session's life (default 24 h, as the processor's). */
  sessionLifetimeSeconds?: number;
}

/** Who caused a change: an API request (its id and idempotency key) or the hosted page (null). */
export interface Cause {
  requestId: string | null;
  idempotencyKey: string | null;
}
const PAGE: Cause = { requestId: null, idempotencyKey: null };

interface SessionExtra {
  lineItems: Stripe.LineItem[];
  piMetadata: Stripe.Metadata;
  piDescription: string | null;
  /** The reason of the last declined attempt on the hosted page. */
  lastError: string | null;
}

/** Ordered by creation so lists come out newest first, as the processor's do. */
class Table<T extends { id: string }> {
  private rows = new Map<string, { seq: number; row: T }>();
  private seq = 0;
  put(row: T): T {
    const had = this.rows.get(row.id);
    this.rows.set(row.id, { seq: had?.seq ?? (this.seq += 1), row });
    return row;
  }
  get(id: string): T | undefined {
    return this.rows.get(id)?.row;
  }
  has(id: string): boolean {
    return this.rows.has(id);
  }
  newestFirst(): T[] {
    return [...this.rows.values()].sort((a, b) => b.seq - a.seq).map((r) => r.row);
  }
  clear() {
    this.rows.clear();
  }
}

export class FakeState {
  readonly customers = new Table<Stripe.Customer>();
  readonly sessions = new Table<Stripe.Checkout.Session>();
  readonly sessionExtra = new Map<string, SessionExtra>();
  readonly paymentIntents = new Table<Stripe.PaymentIntent>();
  readonly charges = new Table<Stripe.Charge>();
  readonly refunds = new Table<Stripe.Refund>();
  readonly balanceTransactions = new Table<Stripe.BalanceTransaction>();
  /** Balance transaction id → the payout that gathered it. */
  readonly payoutOf = new Map<string, string>();
  readonly payouts = new Table<Stripe.Payout>();
  readonly events = new Table<Stripe.Event>();
  readonly deliverer: WebhookDeliverer;
  readonly fee: FeeSchedule;
  private clockOffset = 0;
  payBaseUrl = 'http://127.0.0.1';

  constructor(readonly opts: FakeOptions) {
    if (!/^sk_test_[A-Za-z0-9_]{8,}$/.test(opts.apiKey)) {
      throw new Error('The Stripe fake runs only with a test secret key (sk_test_ followed by at least 8 letters or digits); it refuses any other key.');
    }
    this.fee = opts.fee ?? UK_STANDARD_CARD_FEE;
    this.deliverer = new WebhookDeliverer({
      url: opts.webhookUrl ?? null,
      secret: opts.webhookSecret ?? null,
      retryDelaysMs: opts.retryDelaysMs ?? [1000, 5000, 25000],
      timeoutMs: opts.webhookTimeoutMs ?? 10_000,
    });
  }

  /** Unix seconds on the fake's clock (the wall clock plus whatever a test advanced it by). */
  now(): number {
    return Math.floor(Date.now() / 1000) + this.clockOffset;
  }

  advanceClock(seconds: number): void {
    this.clockOffset += seconds;
    this.expireDueSessions();
  }

  reset(): void {
    for (const t of [this.customers, this.sessions, this.paymentIntents, this.charges, this.refunds, this.balanceTransactions, this.payouts, this.events]) t.clear();
    this.sessionExtra.clear();
    this.payoutOf.clear();
    this.clockOffset = 0;
    this.deliverer.reset();
  }

  // --- events -------------------------------------------------------------------------------------

  private emit(type: Stripe.Event['type'], object: { id: string }, cause: Cause): Stripe.Event {
    const event = {
      id: newId(PREFIX.event),
      object: 'event',
      api_version: API_VERSION,
      created: this.now(),
      // A snapshot, as the processor sends: later changes to the object do not reach a sent event.
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: this.deliverer.enabled ? 1 : 0,
      request: { id: cause.requestId, idempotency_key: cause.idempotencyKey },
      type,
    } as Stripe.Event;
    this.events.put(event);
    this.deliverer.send(event);
    return event;
  }

  resendEvent(id: string): Stripe.Event {
    const event = this.events.get(id);
    if (!event) throw noSuch('event', id);
    this.deliverer.send(event);
    return event;
  }

  // --- customers ----------------------------------------------------------------------------------

  createCustomer(p: { email: string | null; name: string | null; description: string | null; metadata: Stripe.Metadata }): Stripe.Customer {
    return this.customers.put(make.customer({ created: this.now(), ...p }));
  }

  customer(id: string): Stripe.Customer {
    const c = this.customers.get(id);
    if (!c) throw noSuch('customer', id);
    return c;
  }

  // --- checkout sessions --------------------------------------------------------------------------

  createSession(p: {
    currency: string;
    lineItems: make.LineItemInput[];
    successUrl: string | null;
    cancelUrl: string | null;
    customer: string | null;
    customerEmail: string | null;
    clientReferenceId: string | null;
    metadata: Stripe.Metadata;
    piMetadata: Stripe.Metadata;
    piDescription: string | null;
    expiresAt: number | null;
  }): Stripe.Checkout.Session {
    if (p.customer) this.customer(p.customer);
    const created = this.now();
    const items = p.lineItems.map((li) => make.lineItem(created, li));
    const total = items.reduce((sum, li) => sum + li.amount_total, 0);
    if (total <= 0) throw invalid('line_items', 'The total of a Checkout Session in payment mode must be above zero.');
    const lifetime = this.opts.sessionLifetimeSeconds ?? DAY;
    if (p.expiresAt !== null && (p.expiresAt < created + 30 * 60 || p.expiresAt > created + DAY)) {
      throw invalid('expires_at', 'expires_at must be between 30 minutes and 24 hours after the session is created.');
    }
    const session = make.checkoutSession({
      created,
      expiresAt: p.expiresAt ?? created + lifetime,
      currency: p.currency,
      amountTotal: total,
      successUrl: p.successUrl,
      cancelUrl: p.cancelUrl,
      customer: p.customer,
      customerEmail: p.customerEmail,
      clientReferenceId: p.clientReferenceId,
      metadata: p.metadata,
      payBaseUrl: this.payBaseUrl,
    });
    this.sessionExtra.set(session.id, { lineItems: items, piMetadata: p.piMetadata, piDescription: p.piDescription, lastError: null });
    return this.sessions.put(session);
  }

  session(id: string): Stripe.Checkout.Session {
    const s = this.sessions.get(id);
    if (!s) throw noSuch('checkout.session', id);
    return s;
  }

  sessionLineItems(id: string): Stripe.LineItem[] {
    this.session(id);
    return this.sessionExtra.get(id)!.lineItems;
  }

  sessionLastError(id: string): string | null {
    return this.sessionExtra.get(id)?.lastError ?? null;
  }

  expireSession(id: string, cause: Cause): Stripe.Checkout.Session {
    const s = this.session(id);
    if (s.status !== 'open') {
      throw new FakeError(400, 'invalid_request_error', `Only Checkout Sessions with a status in ["open"] can be expired. This Checkout Session has a status of "${s.status}".`, { code: 'checkout_session_unexpected_state' });
    }
    s.status = 'expired';
    s.url = null;
    if (typeof s.payment_intent === 'string') {
      const pi = this.paymentIntents.get(s.payment_intent)!;
      if (pi.status !== 'succeeded' && pi.status !== 'canceled') {
        pi.status = 'canceled';
        pi.canceled_at = this.now();
        pi.cancellation_reason = 'automatic';
      }
    }
    this.emit('checkout.session.expired', s, cause);
    return s;
  }

  /** Sessions past expires_at expire when anything next looks at the fake, as they would on their own. */
  expireDueSessions() {
    const now = this.now();
    for (const s of this.sessions.newestFirst()) if (s.status === 'open' && s.expires_at <= now) this.expireSession(s.id, PAGE);
  }

  /**
   * The hosted page's "Pay": a card number from the documented test cards. A success completes the
   * session; a decline leaves it open with the reason, as the processor's page does.
   */
  payOnPage(sessionId: string, cardNumber: string): { ok: true; session: Stripe.Checkout.Session } | { ok: false; reason: string } {
    this.expireDueSessions();
    const s = this.session(sessionId);
    if (s.status !== 'open') return { ok: false, reason: s.status === 'complete' ? 'This payment has already been made.' : 'This payment page has expired. Go back to the workshop’s page to start again.' };
    const card = cardFor(cardNumber);
    const extra = this.sessionExtra.get(s.id)!;
    if (!card) {
      extra.lastError = 'That number is not one of the test cards listed on this page. No real card can be used here.';
      return { ok: false, reason: extra.lastError };
    }
    let pi = typeof s.payment_intent === 'string' ? this.paymentIntents.get(s.payment_intent)! : null;
    if (!pi) {
      pi = this.paymentIntents.put(
        make.paymentIntent({
          created: this.now(),
          amount: s.amount_total ?? 0,
          currency: s.currency ?? 'gbp',
          customer: typeof s.customer === 'string' ? s.customer : null,
          description: extra.piDescription,
          metadata: { ...extra.piMetadata },
          receiptEmail: null,
          paymentMethod: null,
        }),
      );
      s.payment_intent = pi.id;
    }
    const result = this.attemptCharge(pi, newId(PREFIX.paymentMethod), card, PAGE);
    if (!result.ok) {
      extra.lastError = result.message;
      return { ok: false, reason: result.message };
    }
    extra.lastError = null;
    s.status = 'complete';
    s.payment_status = 'paid';
    s.url = null;
    s.customer_details = {
      address: null,
      business_name: null,
      email: s.customer_email,
      individual_name: null,
      name: null,
      phone: null,
      tax_exempt: 'none',
      tax_ids: [],
    };
    this.emit('checkout.session.completed', s, PAGE);
    return { ok: true, session: s };
  }

  // --- payment intents ----------------------------------------------------------------------------

  createPaymentIntent(
    p: { amount: number; currency: string; customer: string | null; description: string | null; metadata: Stripe.Metadata; receiptEmail: string | null; paymentMethod: string | null; confirm: boolean },
    cause: Cause,
  ): Stripe.PaymentIntent {
    if (p.customer) this.customer(p.customer);
    if (p.paymentMethod) this.testCardFor(p.paymentMethod);
    const pi = this.paymentIntents.put(make.paymentIntent({ created: this.now(), ...p }));
    if (p.confirm) return this.confirmPaymentIntent(pi.id, { paymentMethod: null }, cause);
    return pi;
  }

  paymentIntent(id: string): Stripe.PaymentIntent {
    const pi = this.paymentIntents.get(id);
    if (!pi) throw noSuch('payment_intent', id);
    return pi;
  }

  updatePaymentIntent(id: string, p: { amount?: number; description?: string | null; metadata?: Record<string, string>; receiptEmail?: string | null }): Stripe.PaymentIntent {
    const pi = this.paymentIntent(id);
    const editable = pi.status === 'requires_payment_method' || pi.status === 'requires_confirmation' || pi.status === 'requires_action';
    if (p.amount !== undefined) {
      if (!editable) throw unexpectedState(`You cannot update the amount of a PaymentIntent with a status of ${pi.status}.`);
      pi.amount = p.amount;
    }
    if (p.description !== undefined) pi.description = p.description;
    if (p.receiptEmail !== undefined) pi.receipt_email = p.receiptEmail;
    if (p.metadata) pi.metadata = mergeMetadata(pi.metadata, p.metadata);
    return pi;
  }

  private testCardFor(paymentMethod: string) {
    const number = TEST_PAYMENT_METHODS[paymentMethod];
    if (!number) throw invalid('payment_method', `No such PaymentMethod: '${paymentMethod}'. The fake knows the test payment methods ${Object.keys(TEST_PAYMENT_METHODS).join(', ')}.`);
    return cardFor(number)!;
  }

  confirmPaymentIntent(id: string, p: { paymentMethod: string | null }, cause: Cause): Stripe.PaymentIntent {
    const pi = this.paymentIntent(id);
    if (pi.status !== 'requires_payment_method' && pi.status !== 'requires_confirmation' && pi.status !== 'requires_action') {
      throw unexpectedState(`You cannot confirm this PaymentIntent because it has a status of ${pi.status}.`);
    }
    const method = p.paymentMethod ?? (typeof pi.payment_method === 'string' ? pi.payment_method : null);
    if (!method) throw new FakeError(400, 'invalid_request_error', 'You cannot confirm this PaymentIntent because it is missing a payment method.', { code: 'payment_intent_unexpected_state', param: 'payment_method' });
    const card = this.testCardFor(method);
    const result = this.attemptCharge(pi, method, card, cause);
    if (!result.ok) {
      throw new FakeError(402, 'card_error', result.message, { code: result.code, decline_code: result.declineCode ?? undefined, payment_intent: structuredClone(pi) });
    }
    return pi;
  }

  /**
   * One attempt to charge a card for a PaymentIntent. A decline leaves it (as the processor does —
   * there is no failed status) in requires_payment_method with last_payment_error; a success moves
   * it to succeeded with a charge and that charge's balance transaction.
   */
  private attemptCharge(pi: Stripe.PaymentIntent, paymentMethod: string, card: NonNullable<ReturnType<typeof cardFor>>, cause: Cause): { ok: true } | { ok: false; code: string; declineCode: string | null; message: string } {
    const now = this.now();
    pi.payment_method = paymentMethod;
    if (card.decline) {
      const failed = this.charges.put(make.charge({ created: now, pi, paymentMethod, last4: card.last4, failure: card.decline, balanceTransaction: null }));
      pi.status = 'requires_payment_method';
      pi.latest_charge = failed.id;
      pi.payment_method = null;
      pi.last_payment_error = {
        type: 'card_error',
        code: card.decline.code,
        decline_code: card.decline.declineCode ?? undefined,
        message: card.decline.message,
        charge: failed.id,
        doc_url: undefined,
      };
      this.emit('payment_intent.payment_failed', pi, cause);
      return { ok: false, code: card.decline.code, declineCode: card.decline.declineCode, message: card.decline.message };
    }
    const txnId = newId(PREFIX.balanceTransaction);
    const ch = make.charge({ created: now, pi, paymentMethod, last4: card.last4, failure: null, balanceTransaction: txnId });
    this.charges.put(ch);
    this.balanceTransactions.put(
      make.balanceTransaction({
        id: txnId,
        created: now,
        availableOn: now + (this.opts.availableAfterSeconds ?? 2 * DAY),
        amount: pi.amount,
        fee: cardFee(pi.amount, this.fee),
        currency: pi.currency,
        type: 'charge',
        source: ch.id,
        description: pi.description,
      }),
    );
    pi.status = 'succeeded';
    pi.amount_received = pi.amount;
    pi.latest_charge = ch.id;
    pi.last_payment_error = null;
    this.emit('payment_intent.succeeded', pi, cause);
    return { ok: true };
  }

  cancelPaymentIntent(id: string, reason: Stripe.PaymentIntent.CancellationReason | null, cause: Cause): Stripe.PaymentIntent {
    const pi = this.paymentIntent(id);
    if (pi.status === 'succeeded' || pi.status === 'canceled') {
      throw unexpectedState(`You cannot cancel this PaymentIntent because it has a status of ${pi.status}. Only a PaymentIntent with one of the following statuses may be canceled: requires_payment_method, requires_capture, requires_confirmation, requires_action, processing.`);
    }
    pi.status = 'canceled';
    pi.canceled_at = this.now();
    pi.cancellation_reason = reason ?? 'requested_by_customer';
    this.emit('payment_intent.canceled', pi, cause);
    return pi;
  }

  // --- charges and refunds ------------------------------------------------------------------------

  charge(id: string): Stripe.Charge {
    const ch = this.charges.get(id);
    if (!ch) throw noSuch('charge', id);
    return ch;
  }

  createRefund(p: { paymentIntent: string | null; charge: string | null; amount: number | null; reason: Stripe.Refund.Reason | null; metadata: Stripe.Metadata }, cause: Cause): Stripe.Refund {
    let ch: Stripe.Charge;
    if (p.charge) ch = this.charge(p.charge);
    else if (p.paymentIntent) {
      const pi = this.paymentIntent(p.paymentIntent);
      if (pi.status !== 'succeeded' || typeof pi.latest_charge !== 'string') {
        throw new FakeError(400, 'invalid_request_error', `This PaymentIntent (${pi.id}) does not have a successful charge to refund.`, { code: 'charge_not_refundable' });
      }
      ch = this.charge(pi.latest_charge);
    } else throw new FakeError(400, 'invalid_request_error', 'One of the following params should be provided for this request: payment_intent or charge.', { code: 'parameter_missing' });
    if (ch.status !== 'succeeded') throw new FakeError(400, 'invalid_request_error', `Charge ${ch.id} has no successful payment to refund.`, { code: 'charge_not_refundable' });
    const left = ch.amount - ch.amount_refunded;
    const amount = p.amount ?? left;
    if (left === 0) throw new FakeError(400, 'invalid_request_error', `Charge ${ch.id} has already been refunded.`, { code: 'charge_already_refunded' });
    if (amount <= 0 || amount > left) throw invalid('amount', `Refund amount (${amount}) is greater than unrefunded amount on charge (${left}).`);
    const now = this.now();
    const txnId = newId(PREFIX.balanceTransaction);
    const pi = typeof ch.payment_intent === 'string' ? ch.payment_intent : null;
    const r = this.refunds.put(make.refund({ created: now, amount, currency: ch.currency, charge: ch.id, paymentIntent: pi, reason: p.reason, metadata: p.metadata, balanceTransaction: txnId }));
    // A refund is a negative movement; the processing fee of the original charge is not returned.
    this.balanceTransactions.put(make.balanceTransaction({ id: txnId, created: now, availableOn: now, amount: -amount, fee: 0, currency: ch.currency, type: 'refund', source: r.id, description: 'REFUND FOR CHARGE' }));
    ch.amount_refunded += amount;
    ch.refunded = ch.amount_refunded === ch.amount;
    this.emit('refund.created', r, cause);
    this.emit('charge.refunded', ch, cause);
    return r;
  }

  refund(id: string): Stripe.Refund {
    const r = this.refunds.get(id);
    if (!r) throw noSuch('refund', id);
    return r;
  }

  // --- balance and payouts ------------------------------------------------------------------------

  /** A balance transaction as of now: pending until its available_on, then available. */
  balanceTransaction(id: string): Stripe.BalanceTransaction {
    const t = this.balanceTransactions.get(id);
    if (!t) throw noSuch('balance transaction', id);
    return this.refreshed(t);
  }

  private refreshed(t: Stripe.BalanceTransaction): Stripe.BalanceTransaction {
    t.status = t.available_on <= this.now() ? 'available' : 'pending';
    return t;
  }

  allBalanceTransactions(): Stripe.BalanceTransaction[] {
    return this.balanceTransactions.newestFirst().map((t) => this.refreshed(t));
  }

  /**
   * Pays out every available balance transaction not yet paid out, one payout per currency whose
   * amount is the sum of their nets (nothing is paid out when that sum is not above zero).
   */
  runPayouts(): Stripe.Payout[] {
    const now = this.now();
    const byCurrency = new Map<string, Stripe.BalanceTransaction[]>();
    for (const t of this.allBalanceTransactions()) {
      if (t.type === 'payout' || this.payoutOf.has(t.id) || t.status !== 'available') continue;
      byCurrency.set(t.currency, [...(byCurrency.get(t.currency) ?? []), t]);
    }
    const made: Stripe.Payout[] = [];
    for (const [currency, txns] of byCurrency) {
      const amount = txns.reduce((sum, t) => sum + t.net, 0);
      if (amount <= 0) continue;
      const txnId = newId(PREFIX.balanceTransaction);
      const po = this.payouts.put(make.payout({ created: now, amount, currency, balanceTransaction: txnId }));
      const own = this.balanceTransactions.put(make.balanceTransaction({ id: txnId, created: now, availableOn: now, amount: -amount, fee: 0, currency, type: 'payout', source: po.id, description: 'STRIPE PAYOUT' }));
      for (const t of [...txns, own]) this.payoutOf.set(t.id, po.id);
      this.emit('payout.paid', po, PAGE);
      made.push(po);
    }
    return made;
  }

  payout(id: string): Stripe.Payout {
    const po = this.payouts.get(id);
    if (!po) throw noSuch('payout', id);
    return po;
  }

  event(id: string): Stripe.Event {
    const e = this.events.get(id);
    if (!e) throw noSuch('event', id);
    return e;
  }
}

/** The processor's metadata update: keys merge; a key set to "" is removed. */
function mergeMetadata(current: Stripe.Metadata, update: Record<string, string>): Stripe.Metadata {
  const out: Stripe.Metadata = { ...current };
  for (const [k, v] of Object.entries(update)) {
    if (v === '') delete out[k];
    else out[k] = v;
  }
  return out;
}
