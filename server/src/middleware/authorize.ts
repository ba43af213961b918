import type { Request, RequestHandler } from 'express';
import { QueryTypes } from 'sequelize';
import type { Role } from '@wingstage/shared';
import type { Config } from '../config/config.js';
import { AppError, forbidden, unauthenticated } from '../errors/app-error.js';
import { CSRF_HEADER, SESSION_COOKIE, csrfFor, safeEqual, verifySession } from '../lib/session-tokens.js';
import { User, Workshop, boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';

export interface AuthContext {
  scope: Scope;
  sid: string;
  expiresAt: Date;
  user: User;
  workshop: Workshop;
}

declare module 'express-serve-static-core' {
  interface Request {
    auth?: AuthContext;
    valid?: { body?: unknown; query?: unknown; params?: unknown };
  }
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

async function authenticate(config: Config, req: Request): Promise<AuthContext> {
  const token = req.cookies?.[SESSION_COOKIE] as string | undefined;
  if (!token) throw unauthenticated();
  const claims = verifySession(config, token);
  if (!claims) throw unauthenticated('Your session has ended. Please sign in again.');

  // Checked before anything is loaded: a forged cross-site write learns nothing about the session.
  if (!SAFE_METHODS.has(req.method)) {
    const sent = req.get(CSRF_HEADER) ?? '';
    if (!sent || !safeEqual(sent, csrfFor(config, claims.sid))) {
      throw new AppError('csrf_failed', 403, 'This request could not be verified. Reload the page and try again.');
    }
  }

  const user = await User.findByPk(claims.sub, { include: [{ model: Workshop, as: 'workshop', required: true }] });
  const revoked = await boundSequelize().query('SELECT 1 FROM revoked_sessions WHERE sid = $1', {
    bind: [claims.sid],
    type: QueryTypes.SELECT,
  });
  if (!user || !user.active || !user.passwordHash || user.sessionEpoch !== claims.ep || user.workshopId !== claims.wid || revoked.length > 0) {
    throw unauthenticated('Your session has ended. Please sign in again.');
  }
  const workshop = (user as User & { workshop: Workshop }).workshop;
  return {
    scope: { workshopId: user.workshopId, userId: user.id, role: user.role, customerId: user.customerId },
    sid: claims.sid,
    expiresAt: new Date(claims.exp * 1000),
    user,
    workshop,
  };
}

/** Signed in, with one of the given roles (none given: any signed-in user). */
export function authorize(config: Config, ...roles: Role[]): RequestHandler {
  return async (req, _res, next) => {
    const auth = await authenticate(config, req);
    if (roles.length > 0 && !roles.includes(auth.scope.role)) throw forbidden();
    req.auth = auth;
    next();
  };
}

export function scopeOf(req: Request): Scope {
  if (!req.auth) throw unauthenticated();
  return req.auth.scope;
}
