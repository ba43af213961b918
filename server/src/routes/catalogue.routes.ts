import { Router } from 'express';
import { z } from 'zod';
import { STAFF_ROLES, idListParam, idParamsSchema, idSchema, listQuerySchema, partCreateSchema, partUpdateSchema, supplierCreateSchema, supplierUpdateSchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as catalogue from '../services/catalogue.service.js';

const partListQuerySchema = listQuerySchema.extend({
  ids: idListParam.optional(),
  supplierId: idSchema.optional(),
  active: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
});

const supplierListQuerySchema = listQuerySchema.extend({ ids: idListParam.optional() });

export function suppliersRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), validate({ query: supplierListQuerySchema }), async (req, res) => {
    res.json(await catalogue.listSuppliers(scopeOf(req), validQuery(req, supplierListQuerySchema)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: supplierCreateSchema }), async (req, res) => {
    res.status(201).json(await catalogue.createSupplier(scopeOf(req), validBody(req, supplierCreateSchema)));
  });
  router.patch('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: supplierUpdateSchema }), async (req, res) => {
    res.json(await catalogue.updateSupplier(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, supplierUpdateSchema)));
  });
  return router;
}

export function partsRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...STAFF_ROLES), validate({ query: partListQuerySchema }), async (req, res) => {
    res.json(await catalogue.listParts(scopeOf(req), validQuery(req, partListQuerySchema)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: partCreateSchema }), async (req, res) => {
    res.status(201).json(await catalogue.createPart(scopeOf(req), validBody(req, partCreateSchema)));
  });
  router.patch('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: partUpdateSchema }), async (req, res) => {
    res.json(await catalogue.updatePart(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, partUpdateSchema)));
  });
  return router;
}
