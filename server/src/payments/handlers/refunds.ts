import type { PaymentEventHandlers } from '../../services/payment-events.service.js';

/** Refund events (`charge.refunded`, `refund.created`): bring the payment and its refund rows up to date. */
export const REFUND_EVENT_HANDLERS: PaymentEventHandlers = {};
