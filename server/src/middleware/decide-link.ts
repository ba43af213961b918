import type { RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { tokenParamsSchema } from '@wingstage/shared';
import type { Config } from '../config/config.js';
import { AppError } from '../errors/app-error.js';

/**
 * Per-address limit on the owner's decision links, against guessing tokens. In this process's
 * memory (as sign-in); several processes would need a shared store. `failuresOnly` counts only
 * refused look-ups, for routes a single page calls many times (its photos).
 */
export function decideAddressLimit(config: Pick<Config, 'DECIDE_ADDRESS_LIMIT'>, opts: { failuresOnly?: boolean } = {}): RequestHandler {
  return rateLimit({
    windowMs: 15 * 60_000,
    limit: config.DECIDE_ADDRESS_LIMIT,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    skipSuccessfulRequests: opts.failuresOnly ?? false,
    handler: (_req, _res, next) => next(new AppError('too_many_requests', 429, 'Too many attempts from this address. Wait 15 minutes and try again.')),
  });
}

/** The one answer for a malformed or unknown link, so a guess learns nothing. */
export function invalidDecideLink(): AppError {
  return new AppError('not_found', 404, 'This approval link is not valid. Use the link in the newest e-mail from the workshop.');
}

export function wellFormedToken(token: unknown): boolean {
  return tokenParamsSchema.safeParse({ token }).success;
}
