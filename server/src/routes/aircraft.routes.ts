import { Router } from 'express';
import { z } from 'zod';
import { ROLES, aircraftCreateSchema, aircraftUpdateSchema, idParamsSchema, idSchema, listQuerySchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import * as aircraft from '../services/aircraft.service.js';
import type { Deps } from '../services/deps.js';

const aircraftListQuerySchema = listQuerySchema.extend({ customerId: idSchema.optional() });

export function aircraftRoutes({ config }: Deps): Router {
  const router = Router();
  router.get('/', authorize(config, ...ROLES), validate({ query: aircraftListQuerySchema }), async (req, res) => {
    res.json(await aircraft.listAircraft(scopeOf(req), validQuery(req, aircraftListQuerySchema)));
  });
  router.post('/', authorize(config, 'admin', 'manager'), validate({ body: aircraftCreateSchema }), async (req, res) => {
    res.status(201).json(await aircraft.createAircraft(scopeOf(req), validBody(req, aircraftCreateSchema)));
  });
  router.get('/:id', authorize(config, ...ROLES), validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await aircraft.getAircraft(scopeOf(req), validParams(req, idParamsSchema).id));
  });
  router.patch('/:id', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema, body: aircraftUpdateSchema }), async (req, res) => {
    const body = validBody(req, aircraftUpdateSchema);
    res.json(await aircraft.updateAircraft(scopeOf(req), validParams(req, idParamsSchema).id, body));
  });
  return router;
}

export type AircraftListQuery = z.output<typeof aircraftListQuerySchema>;
