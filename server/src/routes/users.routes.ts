import { Router } from 'express';
import { idParamsSchema, invitationCreateSchema, userListQuerySchema, userUpdateSchema } from '@wingstage/shared';
import { authorize, scopeOf } from '../middleware/authorize.js';
import { validBody, validParams, validQuery, validate } from '../middleware/validate.js';
import type { Deps } from '../services/deps.js';
import * as users from '../services/users.service.js';

export function usersRoutes(deps: Deps): Router {
  const { config } = deps;
  const router = Router();
  router.get('/', authorize(config, 'admin', 'manager'), validate({ query: userListQuerySchema }), async (req, res) => {
    res.json(await users.listUsers(scopeOf(req), validQuery(req, userListQuerySchema)));
  });
  router.post('/invitations', authorize(config, 'admin', 'manager'), validate({ body: invitationCreateSchema }), async (req, res) => {
    res.status(201).json(await users.inviteUser(deps, scopeOf(req), validBody(req, invitationCreateSchema)));
  });
  router.post('/:id/resend-invitation', authorize(config, 'admin', 'manager'), validate({ params: idParamsSchema }), async (req, res) => {
    await users.resendInvitation(deps, scopeOf(req), validParams(req, idParamsSchema).id);
    res.status(204).end();
  });
  router.patch('/:id', authorize(config, 'admin'), validate({ params: idParamsSchema, body: userUpdateSchema }), async (req, res) => {
    res.json(await users.updateUser(scopeOf(req), validParams(req, idParamsSchema).id, validBody(req, userUpdateSchema)));
  });
  return router;
}
