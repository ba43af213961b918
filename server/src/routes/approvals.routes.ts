import { Router } from 'express';
import {
  ROLES,
  STAFF_ROLES,
  approvalRequestCreateSchema,
  quotePhoneAgreementSchema,
  decisionSubmitSchema,
  idParamsSchema,
  preAuthorisationSchema,
} from '@wingstage/shared';
import { invalidDecideLink, wellFormedToken } from '../middleware/decide-link.js';
import { failedLookupsPerAddress, type RateLimits } from '../lib/rate-limits.js';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validate } from '../middleware/validate.js';
import * as approvals from '../services/approvals/index.js';
import type { Deps } from '../services/deps.js';
import * as estimates from '../services/estimates.service.js';
import * as jobs from '../services/jobs.service.js';

/** Staff routes on one job's approvals. Mounted under /api/jobs. */
export function jobApprovalRoutes({ config, ...rest }: Deps): Router {
  const deps = { config, ...rest };
  const router = Router();
  const managers = authorize(config, 'admin', 'manager');

  router.get('/:id/pre-authorisation', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await approvals.getPreAuthorisation(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.put('/:id/pre-authorisation', managers, validate({ params: idParamsSchema, body: preAuthorisationSchema }), async (req, res) => {
    res.json(await approvals.putPreAuthorisation(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, preAuthorisationSchema)));
  });
  router.get('/:id/approval-requests', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await approvals.listRequests(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/quote/phone-agreement', managers, validate({ params: idParamsSchema, body: quotePhoneAgreementSchema }), async (req, res) => {
    const scope = scopeOf(req);
    res.json(
      await estimates.agreeQuoteByPhone(scope, validParams(req, idParamsSchema).id, validBody(req, quotePhoneAgreementSchema), (job, t) => approvals.replaceChangedRequests(deps, scope, job, t)),
    );
  });
  router.post('/:id/decisions-seen', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await approvals.markSeen(scopeOf(req), validParams(req, idParamsSchema).id, jobs.getJob));
  });
  router.post('/:id/approval-requests', managers, validate({ params: idParamsSchema, body: approvalRequestCreateSchema }), async (req, res) => {
    res.status(201).json(await approvals.sendForApproval(deps, scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, approvalRequestCreateSchema)));
  });
  return router;
}

/** Revoke and re-send. Mounted under /api/approval-requests. */
export function approvalRequestRoutes(deps: Deps): Router {
  const router = Router();
  const managers = authorize(deps.config, 'admin', 'manager');
  router.post('/:id/revoke', managers, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await approvals.revokeRequest(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/resend', managers, validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await approvals.resendRequest(deps, scopeOf(req), validParams(req, idParamsSchema).id));
  });
  return router;
}

/**
 * The owner's decision page, reached by the signed link alone: no session, so no CSRF token. Every
 * malformed or unknown token gets the same 404, and failed look-ups are limited per address against
 * guessing (pages that load do not count, so the owner's own link keeps working).
 */
export function decideRoutes(deps: Deps, limits: RateLimits): Router {
  const router = Router();
  const lookups = failedLookupsPerAddress(limits.decideAddress);
  const perAddress = lookups.check;

  router.get('/:token', perAddress, async (req, res) => {
    if (!wellFormedToken(req.params.token)) throw invalidDecideLink();
    res.json(await approvals.getDecisionPage(String(req.params.token)));
  });
  router.post('/:token', perAddress, validate({ body: decisionSubmitSchema }), async (req, res) => {
    if (!wellFormedToken(req.params.token)) throw invalidDecideLink();
    const page = await approvals.submitDecision(deps, String(req.params.token), validBody(req, decisionSubmitSchema), {
      ip: req.ip ?? '',
      userAgent: String(req.headers['user-agent'] ?? ''),
    });
    res.json(page);
  });
  router.use(lookups.countFailure);
  return router;
}
