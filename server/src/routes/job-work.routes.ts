import { Router } from 'express';
import { z } from 'zod';
import {
  ROLES,
  STAFF_ROLES,
  checklistRecordSchema,
  estimateSaveSchema,
  findingActionSchema,
  findingCreateSchema,
  findingUpdateSchema,
  idParamsSchema,
  idSchema,
  timeLogCreateSchema,
  timeLogRemoveSchema,
  timeLogUpdateSchema,
} from '@wingstage/shared';
import { authorize, scopeOf, signedInRead } from '../middleware/authorize.js';
import { validBody, validParams, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as estimates from '../services/estimates.service.js';
import * as findings from '../services/findings.service.js';
import * as approvals from '../services/approvals/index.js';
import { EstimateAnswers, estimateRead } from './estimate-read.js';

const itemParams = z.object({ id: idSchema, itemId: idSchema });
const findingParams = z.object({ id: idSchema, findingId: idSchema });
const timeParams = z.object({ id: idSchema, timeId: idSchema });

/** What hangs off one job: its estimate, checklist, findings and time. Mounted under /api/jobs. */
export function jobWorkRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  const hands = authorize(config, 'admin', 'manager', 'engineer');

  // The answers this app instance made, sent again while PostgreSQL's key for them is unchanged
  // (estimate-read.ts); with ESTIMATE_ANSWERS_MB=0, one statement answers every request. Either way
  // the session is checked in the same round trip, and a malformed id, or a job whose estimate row
  // does not exist yet (the read inserts it), takes the ordinary chain after it.
  router.get(
    '/:id/estimate',
    config.ESTIMATE_ANSWERS_MB > 0
      ? estimateRead(config, ROLES, new EstimateAnswers(Math.floor(config.ESTIMATE_ANSWERS_MB * 1024 * 1024)))
      : signedInRead(config, ROLES, idParamsSchema, (claims, p) => estimates.readEstimateSignedIn(claims, p.id)),
    authorize(config, ...ROLES),
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await estimates.getEstimate(scopeOf(req), validParams(req, idParamsSchema).id));
    },
  );
  router.put('/:id/estimate', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: estimateSaveSchema }), async (req, res) => {
    const scope = scopeOf(req);
    res.json(
      await estimates.saveEstimate(scope, validParams(req, idParamsSchema).id, validBody(req, estimateSaveSchema), (job, t) => approvals.replaceChangedRequests(deps, scope, job, t)),
    );
  });

  router.get('/:id/checklist', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await findings.listChecklist(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.patch('/:id/checklist/:itemId', hands, validate({ params: itemParams, body: checklistRecordSchema }), async (req, res) => {
    const p = validParams(req, itemParams);
    res.json(await findings.recordChecklist(scopeOf(req), p.id, p.itemId, validBody(req, checklistRecordSchema)));
  });

  router.get('/:id/findings', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await findings.listFindings(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/findings', hands, validate({ params: idParamsSchema, body: findingCreateSchema }), async (req, res) => {
    res.status(201).json(await findings.createFinding(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, findingCreateSchema)));
  });
  router.patch('/:id/findings/:findingId', hands, validate({ params: findingParams, body: findingUpdateSchema }), async (req, res) => {
    const p = validParams(req, findingParams);
    res.json(await findings.updateFinding(scopeOf(req), p.id, p.findingId, validBody(req, findingUpdateSchema)));
  });
  router.post('/:id/findings/:findingId/withdraw', authorize(config, 'admin', 'manager'), validate({ params: findingParams, body: findingActionSchema }), async (req, res) => {
    const p = validParams(req, findingParams);
    const scope = scopeOf(req);
    res.json(await findings.withdrawFinding(scope, p.id, p.findingId, validBody(req, findingActionSchema), (job, t) => approvals.replaceChangedRequests(deps, scope, job, t)));
  });
  router.post('/:id/findings/:findingId/rectified', hands, validate({ params: findingParams, body: findingActionSchema }), async (req, res) => {
    const p = validParams(req, findingParams);
    res.json(await findings.markRectified(scopeOf(req), p.id, p.findingId, validBody(req, findingActionSchema)));
  });

  router.get('/:id/time', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await findings.listTime(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.post('/:id/time', hands, validate({ params: idParamsSchema, body: timeLogCreateSchema }), async (req, res) => {
    res.status(201).json(await findings.logTime(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, timeLogCreateSchema)));
  });
  router.patch('/:id/time/:timeId', hands, validate({ params: timeParams, body: timeLogUpdateSchema }), async (req, res) => {
    const p = validParams(req, timeParams);
    res.json(await findings.updateTime(scopeOf(req), p.id, p.timeId, validBody(req, timeLogUpdateSchema)));
  });
  router.delete('/:id/time/:timeId', hands, validate({ params: timeParams, body: timeLogRemoveSchema }), async (req, res) => {
    const p = validParams(req, timeParams);
    await findings.removeTime(scopeOf(req), p.id, p.timeId, validBody(req, timeLogRemoveSchema));
    res.status(204).end();
  });
  return router;
}
