import type { PaymentEventHandlers } from '../../services/payment-events.service.js';
import { syncPayout } from '../../accounts/payouts.js';
import { stripeClient } from '../stripe-client.js';

/** Payout events (`payout.paid`): fetch the payout and its balance transactions, idempotently. */
export const PAYOUT_EVENT_HANDLERS: PaymentEventHandlers = {
  'payout.paid': async (event, { deps, transaction }) => {
    const po = event.data.object as { id: string };
    const stored = await syncPayout(stripeClient(deps.config), po.id, transaction);
    return { workshopId: stored.workshopId };
  },
};
