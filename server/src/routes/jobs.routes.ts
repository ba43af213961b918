import { Router } from 'express';
import { ROLES, STAFF_ROLES, idParamsSchema, jobCreateSchema, jobListQuerySchema, jobTransitionSchema, jobUpdateSchema } from '@wingstage/shared';
import { authorize, scopeOf, signedInRead } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as jobs from '../services/jobs.service.js';

export function jobsRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  router.get('/', authorize(config, ...ROLES), validate({ query: jobListQuerySchema }), async (req, res) => {
    res.json(await jobs.listJobs(scopeOf(req), validQuery(req, jobListQuerySchema)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: jobCreateSchema }), async (req, res) => {
    res.status(201).json(await jobs.createJob(scopeOf(req), validBody(req, jobCreateSchema)));
  });
  // One statement answers it, session check included (signedInRead); a malformed id takes the ordinary chain.
  router.get('/:id', signedInRead(config, ROLES, idParamsSchema, (claims, p) => jobs.readJobSignedIn(claims, p.id)), authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await jobs.getJob(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.patch('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: jobUpdateSchema }), async (req, res) => {
    res.json(await jobs.updateJob(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, jobUpdateSchema)));
  });
  // Engineers pass this gate; the service allows them booked in → inspecting only.
  router.post('/:id/transition', authorize(config, 'admin', 'manager', 'engineer'), validate({ params: idParamsSchema, body: jobTransitionSchema }), async (req, res) => {
    res.json(await jobs.transitionJob(deps, scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, jobTransitionSchema)));
  });
  router.get('/:id/history', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await jobs.jobHistory(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  return router;
}
