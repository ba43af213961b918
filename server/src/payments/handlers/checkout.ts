import type { PaymentEventHandlers } from '../../services/payment-events.service.js';

/**
 * Checkout and payment-intent events: settle the payment a session or intent belongs to (deposits
 * and balances). Each handler runs inside the transaction that records the event.
 */
export const CHECKOUT_EVENT_HANDLERS: PaymentEventHandlers = {};
