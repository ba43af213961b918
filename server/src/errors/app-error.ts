import type { ApiErrorCode } from '@wingstage/shared';

/** The one error type services throw; the error handler turns it into the shared JSON shape. */
export class AppError extends Error {
  constructor(
    readonly code: ApiErrorCode,
    readonly status: number,
    message: string,
    readonly fields?: Record<string, string>,
    /** Sent as `Retry-After` (seconds) with 429 and 503 answers. */
    readonly retryAfterSeconds?: number,
  ) {
    super(message);
    this.name = 'AppError';
  }
}

export const notFound = (what = 'That record') => new AppError('not_found', 404, `${what} was not found.`);
export const forbidden = (message = 'Your role cannot do this.') => new AppError('forbidden', 403, message);
export const unauthenticated = (message = 'Please sign in.') => new AppError('unauthenticated', 401, message);
export const staleVersion = () =>
  new AppError('stale_version', 409, 'Someone else changed this record since you opened it. Reload to see their changes, then try again.');
export const conflict = (message: string, fields?: Record<string, string>) => new AppError('conflict', 409, message, fields);

/** Two changes to the same records met and PostgreSQL had to stop one (deadlock or serialization failure), even after one retry. */
export const busyRecord = () =>
  new AppError('conflict', 409, 'Someone else was changing the same records at that moment, so nothing was saved. Please try again.');
export const databaseUnavailable = () =>
  new AppError('unavailable', 503, 'Wingstage cannot reach its database for a moment. Nothing was lost; please try again shortly.', undefined, 5);
