import { Router } from 'express';
import { STAFF_ROLES, customerCreateSchema, customerUpdateSchema, idParamsSchema, listQuerySchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import * as customers from '../services/customers.service.js';
import type { Deps } from '../services/deps.js';

export function customersRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), validate({ query: listQuerySchema }), async (req, res) => {
    res.json(await customers.listCustomers(scopeOf(req), validQuery(req, listQuerySchema)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: customerCreateSchema }), async (req, res) => {
    res.status(201).json(await customers.createCustomer(scopeOf(req), validBody(req, customerCreateSchema)));
  });
  router.get('/:id', authorize(config, ...STAFF_ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await customers.getCustomer(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.patch('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: customerUpdateSchema }), async (req, res) => {
    const body = validBody(req, customerUpdateSchema);
    res.json(await customers.updateCustomer(scopeOf(req), validParams(req, idParamsSchema).id, body));
  });
  return router;
}
