import express, { Router } from 'express';
import type { Deps } from '../services/deps.js';
import { recordStripeEvent, verifyStripeEvent } from '../services/payment-events.service.js';

/**
 * Webhooks from the card processor. Mounted before the app's JSON parser: the signature covers the
 * exact bytes sent, so the body is read raw and never re-serialised. No session or CSRF token: the
 * signature is the authentication.
 */
export function webhooksRoutes(deps: Deps): Router {
  const router = Router();
  router.post('/stripe', express.raw({ type: 'application/json', limit: '512kb' }), async (req, res) => {
    const started = process.hrtime.bigint();
    const event = verifyStripeEvent(deps.config, req.body, req.get('Stripe-Signature'));
    const receipt = await recordStripeEvent(deps, event);
    req.log.info({ eventId: event.id, type: event.type, duplicate: receipt.duplicate, outcome: receipt.outcome, ms: Number(process.hrtime.bigint() - started) / 1e6 }, 'payment event');
    res.json(receipt);
  });
  return router;
}
