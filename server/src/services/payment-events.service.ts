import Stripe from 'stripe';
import { QueryTypes, type Transaction } from 'sequelize';
import { z } from 'zod';
import { AppError } from '../errors/app-error.js';
import { PaymentEvent, boundSequelize } from '../models/index.js';
import { stripeClient } from '../payments/stripe-client.js';
import type { PaymentEventOutcome } from '../models/payment-event.model.js';
import type { Deps } from './deps.js';
import { CHECKOUT_EVENT_HANDLERS } from '../payments/handlers/checkout.js';
import { REFUND_EVENT_HANDLERS } from '../payments/handlers/refunds.js';
import { PAYOUT_EVENT_HANDLERS } from '../payments/handlers/payouts.js';

/**
 * A handler acts on one event inside the transaction that records it, so the record and its effect
 * are written together or not at all. It may name the workshop the event turned out to belong to.
 */
export type PaymentEventHandler = (event: Stripe.Event, ctx: { deps: Deps; transaction: Transaction }) => Promise<{ workshopId: string | null } | void>;
export type PaymentEventHandlers = Partial<Record<Stripe.Event['type'], PaymentEventHandler>>;

/**
 * The types the payment flows act on. Until a handler for one is registered below, its
 * events are kept with the outcome "recorded"; every other type is acknowledged and "ignored".
 */
export const PAYMENT_EVENT_TYPES_USED: readonly Stripe.Event['type'][] = [
  'checkout.session.completed',
  'checkout.session.expired',
  'payment_intent.succeeded',
  'payment_intent.payment_failed',
  'charge.refunded',
  'refund.created',
  'payout.paid',
];

/**
 * The handlers in use, by event type, gathered from server/src/payments/handlers/ (checkout and
 * payment intents; refunds; payouts). A type handled twice is a mistake caught at start-up.
 */
export const PAYMENT_EVENT_HANDLERS: PaymentEventHandlers = mergeHandlers([CHECKOUT_EVENT_HANDLERS, REFUND_EVENT_HANDLERS, PAYOUT_EVENT_HANDLERS]);

function mergeHandlers(groups: PaymentEventHandlers[]): PaymentEventHandlers {
  const merged: PaymentEventHandlers = {};
  for (const group of groups) {
    for (const [type, handler] of Object.entries(group) as [Stripe.Event['type'], PaymentEventHandler][]) {
      if (merged[type]) throw new Error(`Two handlers for payment event type ${type}.`);
      merged[type] = handler;
    }
  }
  return merged;
}

const SIGNATURE_REFUSED = 'The webhook signature could not be verified: it is missing, made with another secret, older than five minutes, or the body was changed.';

/** What the SDK's verifier hands back must still look like an event before anything is written. */
const eventShape = z.object({
  id: z.string().regex(/^evt_[A-Za-z0-9_]{1,250}$/),
  object: z.literal('event'),
  type: z.string().min(1).max(200),
  created: z.number().int().nonnegative(),
  livemode: z.boolean(),
  api_version: z.string().nullable().optional(),
  data: z.object({ object: z.object({ id: z.string().max(255).optional() }).loose() }).loose(),
}).loose();

/**
 * Checks the `Stripe-Signature` header against the raw bytes with the SDK's own verifier (HMAC-SHA256
 * of "<t>.<body>", 300 s tolerance) and returns the parsed body. Anything that fails is a 400.
 * `receivedAt` (unix seconds) is for checking published vectors; the route uses the clock.
 */
export function checkStripeSignature(config: Deps['config'], raw: unknown, signature: string | undefined, receivedAt?: number): unknown {
  if (!Buffer.isBuffer(raw) || raw.length === 0) {
    throw new AppError('validation_failed', 400, 'The webhook body is missing or is not sent as application/json.');
  }
  if (!signature) throw new AppError('validation_failed', 400, SIGNATURE_REFUSED);
  try {
    // The SDK takes the receiving time in milliseconds.
    return stripeClient(config).webhooks.constructEvent(raw, signature, config.STRIPE_WEBHOOK_SECRET, undefined, undefined, receivedAt === undefined ? undefined : receivedAt * 1000);
  } catch (err) {
    if (err instanceof Stripe.errors.StripeSignatureVerificationError) throw new AppError('validation_failed', 400, SIGNATURE_REFUSED);
    // Correctly signed but not JSON: still refused, and still nothing written.
    if (err instanceof SyntaxError) throw new AppError('validation_failed', 400, 'The webhook body is not valid JSON.');
    throw err;
  }
}

/** A verified body that also looks like an event, or a 400 before anything is written. */
export function verifyStripeEvent(config: Deps['config'], raw: unknown, signature: string | undefined): Stripe.Event {
  const body = checkStripeSignature(config, raw, signature);
  if (!eventShape.safeParse(body).success) throw new AppError('validation_failed', 400, 'The webhook body is not an event: it needs an evt_ id, a type, a creation time and data.object.');
  return body as Stripe.Event;
}

export interface WebhookReceipt {
  received: true;
  eventId: string;
  /** True when this event id was already recorded: nothing new was written. */
  duplicate: boolean;
  outcome: PaymentEventOutcome | null;
}

/**
 * Records the event under its unique id and runs its handler in the same transaction. A second
 * delivery (a retry, a resend, or the same event racing itself) meets the unique constraint: the
 * insert waits for the first transaction, then does nothing, and the receipt says duplicate.
 */
export async function recordStripeEvent(deps: Deps, event: Stripe.Event, handlers: PaymentEventHandlers = PAYMENT_EVENT_HANDLERS): Promise<WebhookReceipt> {
  const sequelize = boundSequelize();
  return sequelize.transaction(async (transaction) => {
    const handler = handlers[event.type];
    const outcome: PaymentEventOutcome = handler ? 'processed' : PAYMENT_EVENT_TYPES_USED.includes(event.type) ? 'recorded' : 'ignored';
    const objectId = (event.data.object as { id?: unknown }).id;
    const inserted = await sequelize.query<{ id: string }>(
      `INSERT INTO payment_events (id, stripe_event_id, type, livemode, api_version, object_id, outcome, stripe_created_at, payload)
       VALUES (gen_random_uuid(), $1, $2, $3, $4, $5, $6, to_timestamp($7), $8::jsonb)
       ON CONFLICT (stripe_event_id) DO NOTHING
       RETURNING id`,
      {
        bind: [event.id, event.type, event.livemode, event.api_version ?? null, typeof objectId === 'string' ? objectId : null, outcome, event.created, JSON.stringify(event)],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    const row = inserted[0];
    if (!row) return { received: true, eventId: event.id, duplicate: true, outcome: null };
    if (handler) {
      const result = await handler(event, { deps, transaction });
      if (result?.workshopId) await PaymentEvent.update({ workshopId: result.workshopId }, { where: { id: row.id }, transaction });
    }
    return { received: true, eventId: event.id, duplicate: false, outcome };
  });
}
