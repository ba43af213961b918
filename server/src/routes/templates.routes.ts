import { Router } from 'express';
import { STAFF_ROLES, idParamsSchema, templateCreateSchema, templateUpdateSchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as templates from '../services/templates.service.js';

export function templatesRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), async (req, res) => {
    res.json(await templates.listTemplates(scopeOf(req)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: templateCreateSchema }), async (req, res) => {
    res.status(201).json(await templates.createTemplate(scopeOf(req), validBody(req, templateCreateSchema)));
  });
  router.get('/:id', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await templates.getTemplate(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.put('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: templateUpdateSchema }), async (req, res) => {
    res.json(await templates.updateTemplate(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, templateUpdateSchema)));
  });
  return router;
}
