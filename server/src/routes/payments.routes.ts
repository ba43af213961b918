import { Router } from 'express';
import {
  ROLES,
  STAFF_ROLES,
  checkoutCreateSchema,
  checkoutSyncSchema,
  depositAccountsQuerySchema, depositListQuerySchema,
  depositParamsSchema,
  depositRequestCancelSchema,
  depositRequestCreateSchema,
  idParamsSchema,
} from '@wingstage/shared';
import { failedLookupsPerAddress, type RateLimits } from '../lib/rate-limits.js';
import { invalidDecideLink, wellFormedToken } from '../middleware/decide-link.js';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import { openCheckout, syncCheckout } from '../payments/checkout.service.js';
import type { Deps } from '../services/deps.js';
import * as deposits from '../services/deposits.service.js';

/** Card payments and deposits on one job. Mounted under /api/jobs. */
export function jobPaymentRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  const managers = authorize(config, 'admin', 'manager');

  // The owner of the job pays; the server works out the amount (a deposit asked, or the invoice's balance).
  router.post('/:id/payments/checkout', authorize(config, 'owner'), validate({ params: idParamsSchema, body: checkoutCreateSchema }), async (req, res) => {
    const { url } = await openCheckout(deps, scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, checkoutCreateSchema));
    res.status(201).json({ url });
  });
  // Back from the payment page: the session is read through the processor before anything is said.
  router.post('/:id/payments/sync', authorize(config, ...ROLES), validate({ params: idParamsSchema, body: checkoutSyncSchema }), async (req, res) => {
    const out = await syncCheckout(deps, scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, checkoutSyncSchema).sessionId);
    if (scopeOf(req).role === 'owner') {
      out.payment = { ...out.payment, fee: null, net: null, outcomeNote: null, amountMismatch: false };
      if (out.deposit) out.deposit = { ...out.deposit, payments: out.deposit.payments.map((p) => ({ ...p, fee: null, net: null, outcomeNote: null, amountMismatch: false })) };
    }
    res.json(out);
  });

  router.get('/:id/deposits', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await deposits.listJobDeposits(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/deposits', managers, validate({ params: idParamsSchema, body: depositRequestCreateSchema }), async (req, res) => {
    res.status(201).json(await deposits.createDeposit(deps, scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, depositRequestCreateSchema)));
  });
  router.post('/:id/deposits/:depositId/cancel', managers, validate({ params: depositParamsSchema, body: depositRequestCancelSchema }), async (req, res) => {
    const p = validParams(req, depositParamsSchema);
    res.json(await deposits.cancelDeposit(deps, scopeOf(req), p.id, p.depositId, validBody(req, depositRequestCancelSchema)));
  });
  return router;
}

/** Deposits across the workshop. Mounted under /api/deposits. */
export function depositRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/waiting', authorize(config, ...STAFF_ROLES), validate({ query: depositListQuerySchema }), async (req, res) => {
    res.json(await deposits.listWaitingDeposits(scopeOf(req), validQuery(req, depositListQuerySchema)));
  });
  router.get('/accounts', authorize(config, 'admin', 'manager', 'accounts'), validate({ query: depositAccountsQuerySchema }), async (req, res) => {
    res.json(await deposits.depositAccounts(scopeOf(req), validQuery(req, depositAccountsQuerySchema)));
  });
  return router;
}

/** The deposits an owner's decision raised, for the decision page's receipt. Mounted under /api/decide; failed look-ups count as the page's do. */
export function decideDepositRoutes(_deps: Deps, limits: RateLimits): Router {
  const router = Router();
  const lookups = failedLookupsPerAddress(limits.decideAddress);
  router.get('/:token/deposits', lookups.check, async (req, res) => {
    if (!wellFormedToken(req.params.token)) throw invalidDecideLink();
    res.set('Cache-Control', 'no-store').json(await deposits.depositsForDecisionLink(String(req.params.token)));
  });
  router.use(lookups.countFailure);
  return router;
}
