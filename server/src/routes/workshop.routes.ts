import { Router } from 'express';
import { STAFF_ROLES, workshopUpdateSchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as workshop from '../services/workshop.service.js';

export function workshopRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), async (req, res) => {
    res.json(await workshop.getWorkshop(scopeOf(req)));
  });
  router.patch('/', authorize(config, 'admin'), validate({ body: workshopUpdateSchema }), async (req, res) => {
    const body = validBody(req, workshopUpdateSchema);
    res.json(await workshop.updateWorkshop(scopeOf(req), body));
  });
  return router;
}
