import { createHash, createHmac, createSecretKey, randomBytes, randomUUID, timingSafeEqual, type KeyObject } from 'node:crypto';
import jwt from 'jsonwebtoken';
import type { CookieOptions } from 'express';
import type { Config } from '../config/config.js';

export const SESSION_COOKIE = 'ws_session';
export const CSRF_COOKIE = 'ws_csrf';
export const CSRF_HEADER = 'x-csrf-token';
export const SESSION_HOURS = 12;

export interface SessionClaims {
  sub: string;
  sid: string;
  /** The user's session epoch when this token was issued. */
  ep: number;
  wid: string;
}

/**
 * The secret as a KeyObject, made once per secret. Given a string, jsonwebtoken first tries it as a
 * PEM public key (a thrown and caught error) and then builds a key object, on every request: that
 * was a visible slice of each signed-in request's CPU in the profile.
 */
const keys = new Map<string, KeyObject>();
function keyOf(secret: string): KeyObject {
  let key = keys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret, 'utf8'));
    keys.set(secret, key);
  }
  return key;
}

export function issueSession(config: Pick<Config, 'JWT_SECRET'>, user: { id: string; sessionEpoch: number; workshopId: string }) {
  const sid = randomUUID();
  const claims: SessionClaims = { sub: user.id, sid, ep: user.sessionEpoch, wid: user.workshopId };
  const token = jwt.sign(claims, keyOf(config.JWT_SECRET), { algorithm: 'HS256', expiresIn: `${SESSION_HOURS}h`, issuer: 'wingstage' });
  return { token, sid, csrf: csrfFor(config, sid) };
}

/** A verified session token's claims, with its expiry (seconds since the epoch). */
export type TokenClaims = SessionClaims & { exp: number };

export function verifySession(config: Pick<Config, 'JWT_SECRET'>, token: string): TokenClaims | null {
  try {
    const decoded = jwt.verify(token, keyOf(config.JWT_SECRET), { algorithms: ['HS256'], issuer: 'wingstage' });
    if (typeof decoded !== 'object' || decoded === null) return null;
    const c = decoded as Partial<SessionClaims> & { exp?: number };
    if (typeof c.sub !== 'string' || typeof c.sid !== 'string' || typeof c.ep !== 'number' || typeof c.wid !== 'string' || typeof c.exp !== 'number') return null;
    return c as SessionClaims & { exp: number };
  } catch {
    return null;
  }
}

/** The CSRF token is bound to the session: an HMAC of its id under the server's secret. */
export function csrfFor(config: Pick<Config, 'JWT_SECRET'>, sid: string): string {
  return createHmac('sha256', config.JWT_SECRET).update(`csrf:${sid}`).digest('base64url');
}

export function safeEqual(a: string, b: string): boolean {
  const ab = Buffer.from(a);
  const bb = Buffer.from(b);
  if (ab.length !== bb.length) return false;
  return timingSafeEqual(ab, bb);
}

export function sessionCookieOptions(config: Pick<Config, 'COOKIE_SECURE'>): CookieOptions {
  return { httpOnly: true, sameSite: 'lax', secure: config.COOKIE_SECURE, path: '/', maxAge: SESSION_HOURS * 3600_000 };
}

export function csrfCookieOptions(config: Pick<Config, 'COOKIE_SECURE'>): CookieOptions {
  return { httpOnly: false, sameSite: 'strict', secure: config.COOKIE_SECURE, path: '/', maxAge: SESSION_HOURS * 3600_000 };
}

/** One-time tokens for e-mailed links: 256 random bits, only the SHA-256 is stored. */
export function newOneTimeToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
