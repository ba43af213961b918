import type { Request, RequestHandler } from 'express';
import { QueryTypes } from 'sequelize';
import type { Role } from '@wingstage/shared';
import type { Config } from '../config/config.js';
import { AppError, forbidden, unauthenticated } from '../errors/app-error.js';
import { CSRF_HEADER, SESSION_COOKIE, csrfFor, safeEqual, verifySession } from '../lib/session-tokens.js';
import { boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';
import type { SessionUser, SessionWorkshop } from '../services/dto.js';

export interface AuthContext {
  scope: Scope;
  sid: string;
  expiresAt: Date;
  user: SessionUser;
  workshop: SessionWorkshop;
}

declare module 'express-serve-static-core' {
  interface Request {
    auth?: AuthContext;
    valid?: { body?: unknown; query?: unknown; params?: unknown };
  }
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

type SessionRow = SessionUser & { workshopName: string; currency: string; contactPhone: string; contactEmail: string; revoked: boolean };

const SESSION_SQL = `
  SELECT u.id, u.workshop_id AS "workshopId", u.email, u.name, u.role, u.active, u.customer_id AS "customerId",
         u.password_hash AS "passwordHash", u.session_epoch AS "sessionEpoch", u.created_at AS "createdAt",
         w.name AS "workshopName", w.currency,
         COALESCE(w.settings->>'contactPhone', '') AS "contactPhone", COALESCE(w.settings->>'contactEmail', '') AS "contactEmail",
         EXISTS (SELECT 1 FROM revoked_sessions r WHERE r.sid = $2) AS revoked
  FROM users u JOIN workshops w ON w.id = u.workshop_id
  WHERE u.id = $1`;

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

  // One indexed read per request: the user by primary key, its workshop, and whether this session
  // was signed out. (Two ORM queries with instance building cost about as much as the work behind.)
  const rows = await boundSequelize().query<SessionRow>(SESSION_SQL, { bind: [claims.sub, claims.sid], type: QueryTypes.SELECT, raw: true });
  const row = rows[0];
  if (!row || !row.active || !row.passwordHash || row.sessionEpoch !== claims.ep || row.workshopId !== claims.wid || row.revoked) {
    throw unauthenticated('Your session has ended. Please sign in again.');
  }
  const { workshopName, currency, contactPhone, contactEmail, revoked: _revoked, ...user } = row;
  const workshop: SessionWorkshop = { id: user.workshopId, name: workshopName, currency, contact: { phone: contactPhone, email: contactEmail } };
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
