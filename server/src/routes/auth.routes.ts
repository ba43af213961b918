import { Router, type Response } from 'express';
import {
  invitationAcceptSchema,
  passwordResetCompleteSchema,
  passwordResetRequestSchema,
  signInSchema,
  tokenParamsSchema,
} from '@wingstage/shared';
import { perAddress as countPerAddress } from '../lib/rate-limits.js';
import { CSRF_COOKIE, SESSION_COOKIE, csrfCookieOptions, csrfFor, sessionCookieOptions } from '../lib/session-tokens.js';
import { authorize } from '../middleware/authorize.js';
import { validBody, validParams, validate } from '../middleware/validate.js';
import * as auth from '../services/auth.service.js';
import type { Deps } from '../services/deps.js';

export function authRoutes(deps: Deps, guards: auth.AuthGuards): Router {
  const { config } = deps;
  const router = Router();

  // Per address, counted in PostgreSQL: every app process shares the one count.
  const perAddress = countPerAddress(guards.limits.authAddress);

  const setSession = (res: Response, s: auth.IssuedSession) => {
    res.cookie(SESSION_COOKIE, s.token, sessionCookieOptions(config));
    res.cookie(CSRF_COOKIE, s.csrf, csrfCookieOptions(config));
  };
  const clearSession = (res: Response) => {
    const { maxAge: _a, ...s } = sessionCookieOptions(config);
    const { maxAge: _b, ...c } = csrfCookieOptions(config);
    res.clearCookie(SESSION_COOKIE, s);
    res.clearCookie(CSRF_COOKIE, c);
  };

  router.post('/sign-in', perAddress, validate({ body: signInSchema }), async (req, res) => {
    const session = await auth.signIn(deps, guards, validBody(req, signInSchema));
    setSession(res, session);
    res.json(session.dto);
  });

  router.post('/sign-out', authorize(config), async (req, res) => {
    await auth.signOut(req.auth!.user.id, req.auth!.sid, req.auth!.expiresAt);
    clearSession(res);
    res.status(204).end();
  });

  router.get('/session', authorize(config), (req, res) => {
    const a = req.auth!;
    const csrf = csrfFor(config, a.sid);
    // Re-set the readable cookie in case the browser dropped it; the value is tied to the session.
    res.cookie(CSRF_COOKIE, csrf, csrfCookieOptions(config));
    res.json(auth.currentSession(deps, a.user, a.workshop, csrf));
  });

  router.post('/password-reset', perAddress, validate({ body: passwordResetRequestSchema }), async (req, res) => {
    await auth.requestPasswordReset(deps, validBody(req, passwordResetRequestSchema).email);
    res.status(202).json({ message: 'If that address has a sign-in, a reset link is on its way.' });
  });

  router.post('/password-reset/complete', perAddress, validate({ body: passwordResetCompleteSchema }), async (req, res) => {
    await auth.completePasswordReset(guards, validBody(req, passwordResetCompleteSchema));
    clearSession(res);
    res.status(204).end();
  });

  router.get('/invitations/:token', perAddress, validate({ params: tokenParamsSchema }), async (req, res) => {
    res.json(await auth.describeInvitation(validParams(req, tokenParamsSchema).token));
  });

  router.post('/invitations/accept', perAddress, validate({ body: invitationAcceptSchema }), async (req, res) => {
    const session = await auth.acceptInvitation(deps, guards, validBody(req, invitationAcceptSchema));
    setSession(res, session);
    res.json(session.dto);
  });

  return router;
}
