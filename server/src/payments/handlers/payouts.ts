import type { PaymentEventHandlers } from '../../services/payment-events.service.js';

/** Payout events (`payout.paid`): fetch the payout and its balance transactions, idempotently. */
export const PAYOUT_EVENT_HANDLERS: PaymentEventHandlers = {};
