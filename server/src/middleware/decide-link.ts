import { tokenParamsSchema } from '@wingstage/shared';
import { AppError } from '../errors/app-error.js';

// The per-address limit on failed look-ups lives in lib/rate-limits.ts (failedLookupsPerAddress), counted in PostgreSQL.

/** The one answer for a malformed or unknown link, so a guess learns nothing. */
export function invalidDecideLink(): AppError {
  return new AppError('not_found', 404, 'This approval link is not valid. Use the link in the newest e-mail from the workshop.');
}

export function wellFormedToken(token: unknown): boolean {
  return tokenParamsSchema.safeParse({ token }).success;
}
