import type { Request, RequestHandler } from 'express';
import type { z } from 'zod';
import type { Role } from '@wingstage/shared';
import type { Config } from '../config/config.js';
import { AppError, forbidden, unauthenticated } from '../errors/app-error.js';
import { CSRF_HEADER, SESSION_COOKIE, csrfFor, safeEqual, verifySession } from '../lib/session-tokens.js';
import { boundSequelize } from '../models/index.js';
import { preparedRows } from '../db/prepared.js';
import { JsonText } from '../lib/json-text.js';
import type { Scope } from '../services/scope.js';
import type { SessionUser, SessionWorkshop } from '../services/dto.js';
import { SESSION_SQL, type SessionRow } from '../services/session-row.js';
import type { TokenClaims } from '../lib/session-tokens.js';

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


/** Everything but the database: the cookie's signature and expiry, and the CSRF header on a write. */
export function tokenClaims(config: Config, req: Request): TokenClaims {
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
  return claims;
}

/**
 * The session row against the token: the user still exists and is active, has a password, the same
 * session epoch and workshop, and this session was not signed out; then the role. 401 / 403 otherwise.
 * The row may carry more columns (a folded read's own); only the session's are kept.
 */
export function acceptSession(claims: TokenClaims, row: SessionRow | undefined, roles: readonly Role[] = []): AuthContext {
  if (!row || !row.active || !row.passwordHash || row.sessionEpoch !== claims.ep || row.workshopId !== claims.wid || row.revoked) {
    throw unauthenticated('Your session has ended. Please sign in again.');
  }
  const user: SessionUser = {
    id: row.id,
    workshopId: row.workshopId,
    email: row.email,
    name: row.name,
    role: row.role,
    active: row.active,
    customerId: row.customerId,
    passwordHash: row.passwordHash,
    sessionEpoch: row.sessionEpoch,
    createdAt: row.createdAt,
  };
  const workshop: SessionWorkshop = { id: row.workshopId, name: row.workshopName, currency: row.currency, contact: { phone: row.contactPhone, email: row.contactEmail } };
  if (roles.length > 0 && !roles.includes(user.role)) throw forbidden();
  return {
    scope: { workshopId: user.workshopId, userId: user.id, role: user.role, customerId: user.customerId },
    sid: claims.sid,
    expiresAt: new Date(claims.exp * 1000),
    user,
    workshop,
  };
}

async function authenticate(config: Config, req: Request, roles: readonly Role[]): Promise<AuthContext> {
  const claims = tokenClaims(config, req);
  // One indexed read per request (two ORM queries with instance building cost about as much as the
  // work behind). The hottest reads fold this check into their own statement instead (signedInRead).
  const rows = await preparedRows<SessionRow>(boundSequelize(), 'session-check', SESSION_SQL, [claims.sub, claims.sid]);
  return acceptSession(claims, rows[0], roles);
}

/** Signed in, with one of the given roles (none given: any signed-in user). */
export function authorize(config: Config, ...roles: Role[]): RequestHandler {
  return async (req, _res, next) => {
    req.auth = await authenticate(config, req, roles);
    next();
  };
}

export function scopeOf(req: Request): Scope {
  if (!req.auth) throw unauthenticated();
  return req.auth.scope;
}

/**
 * A read whose own statement checks the session too: one round trip for the whole request. `read`
 * gets the verified token's claims and the parsed params, runs ONE statement that selects the
 * session row (SESSION_SQL as a CTE) beside its data, and returns that row and a function making the
 * answer from the accepted session. The answer is only made once the session passed, so a revoked
 * or signed-out session learns nothing, and the same 401/403 as `authorize` come first.
 *
 * When the params do not parse, or `read` returns null (a case it leaves to the ordinary path), the
 * request falls through to the next handlers on the route: authorize, validate, the plain handler.
 */
export function signedInRead<S extends z.ZodType>(
  config: Config,
  roles: readonly Role[],
  params: S,
  read: (claims: TokenClaims, params: z.output<S>) => Promise<{ session: SessionRow | undefined; answer: (auth: AuthContext) => unknown } | null>,
): RequestHandler {
  return async (req, res, next) => {
    const claims = tokenClaims(config, req);
    const parsed = params.safeParse(req.params);
    if (!parsed.success) return next();
    const got = await read(claims, parsed.data);
    if (!got) return next();
    const auth = acceptSession(claims, got.session, roles);
    req.auth = auth;
    const answer = got.answer(auth);
    if (answer instanceof JsonText) res.type('application/json').send(answer.text);
    else res.json(answer);
  };
}
