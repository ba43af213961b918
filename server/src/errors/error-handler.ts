import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError } from 'zod';
import {
  DatabaseError,
  ForeignKeyConstraintError,
  OptimisticLockError,
  UniqueConstraintError,
  ValidationError as SequelizeValidationError,
} from 'sequelize';
import { MoneyError, StateMoveError, type ApiErrorBody, type ApiErrorCode } from '@wingstage/shared';
import { isDatabaseUnavailable, isTransactionCollision, sqlState } from '../db/db-errors.js';
import { AppError, busyRecord, databaseUnavailable } from './app-error.js';

/** Which column each unique constraint guards, and what to tell the person who hit it. */
const UNIQUE_MESSAGES: Record<string, { field: string; message: string }> = {
  users_email_key: { field: 'email', message: 'Someone already signs in with this e-mail.' },
  aircraft_workshop_registration_key: { field: 'registration', message: 'An aircraft with this registration is already on file.' },
  parts_workshop_number_key: { field: 'partNumber', message: 'A part with this number is already in the catalogue.' },
};

function zodFields(err: ZodError): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of err.issues) {
    const key = issue.path.map(String).join('.') || '_';
    if (!(key in fields)) fields[key] = issue.message;
  }
  return fields;
}

interface Mapped {
  status: number;
  code: ApiErrorCode;
  message: string;
  fields?: Record<string, string>;
  retryAfterSeconds?: number;
}

const fromAppError = (err: AppError): Mapped => ({ status: err.status, code: err.code, message: err.message, fields: err.fields, retryAfterSeconds: err.retryAfterSeconds });

function mapError(err: unknown): Mapped | null {
  if (err instanceof AppError) return fromAppError(err);
  // A forbidden state move: the transaction rolled back, so nothing was written.
  if (err instanceof StateMoveError) return { status: 409, code: 'invalid_transition', message: err.reason };
  if (err instanceof MoneyError) {
    return { status: 422, code: 'invalid_amount', message: `An amount could not be worked out: ${err.detail}${err.path ? ` (at ${err.path})` : ''}`, fields: err.path ? { [err.path]: err.detail } : undefined };
  }
  // Checked before the Sequelize classes below: a dropped connection surfaces as a DatabaseError too.
  if (isDatabaseUnavailable(err)) return fromAppError(databaseUnavailable());
  // A collision outside inTransaction (or left after its retry) is still a plain 409, never a 500.
  if (isTransactionCollision(err)) return fromAppError(busyRecord());
  if (err instanceof ZodError) {
    return { status: 400, code: 'validation_failed', message: 'Some fields need attention.', fields: zodFields(err) };
  }
  if (err instanceof OptimisticLockError) {
    return { status: 409, code: 'stale_version', message: 'Someone else changed this record since you opened it. Reload to see their changes, then try again.' };
  }
  if (err instanceof UniqueConstraintError) {
    const constraint = (err.parent as { constraint?: string } | undefined)?.constraint ?? '';
    const known = UNIQUE_MESSAGES[constraint];
    if (known) return { status: 409, code: 'conflict', message: known.message, fields: { [known.field]: known.message } };
    return { status: 409, code: 'conflict', message: 'This would duplicate a record that already exists.' };
  }
  if (err instanceof ForeignKeyConstraintError) {
    return { status: 409, code: 'conflict', message: 'This refers to a record that does not exist, or is still in use.' };
  }
  if (err instanceof DatabaseError) {
    const code = sqlState(err);
    // Text PostgreSQL cannot store (NUL, broken characters): the shared schemas refuse it first; this is the backstop.
    if (code === '22021' || code === '22P05') {
      return { status: 400, code: 'validation_failed', message: 'Some text could not be stored: remove any invisible control characters and try again.' };
    }
    if (code === '22P02') return { status: 400, code: 'validation_failed', message: 'A value is not in a form that can be stored. Check the numbers and ids.' };
    // PostgreSQL's own checks (out-of-range number, over-long text, CHECK constraint): the input is at fault.
    if (code === '22003' || code === '22001' || code === '23514' || code === '22007' || code === '22008') {
      return { status: 400, code: 'validation_failed', message: 'A value is outside what can be stored. Check the numbers and dates.' };
    }
  }
  if (err instanceof SequelizeValidationError) {
    const fields: Record<string, string> = {};
    for (const e of err.errors) if (e.path) fields[e.path] = e.message;
    return { status: 400, code: 'validation_failed', message: 'Some fields need attention.', fields };
  }
  const e = err as { type?: string; status?: number };
  if (e && e.type === 'entity.parse.failed') return { status: 400, code: 'validation_failed', message: 'The request body is not valid JSON.' };
  if (e && e.type === 'entity.too.large') return { status: 413, code: 'validation_failed', message: 'The request body is too large.' };
  // Other client errors raised by Express middleware (e.g. a missing static file) keep their status.
  if (e && typeof e.status === 'number' && e.status >= 400 && e.status < 500) {
    return e.status === 404
      ? { status: 404, code: 'not_found', message: 'That file was not found.' }
      : { status: e.status, code: 'validation_failed', message: 'The request could not be handled.' };
  }
  return null;
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const mapped = mapError(err);
  const requestId = String(req.id ?? '');
  if (!mapped) {
    req.log?.error({ err }, 'unhandled error');
  } else if (mapped.status >= 500) {
    req.log?.error({ err }, mapped.message);
  }
  const m = mapped ?? { status: 500, code: 'internal' as const, message: 'Something went wrong on our side. It has been logged; please try again.' };
  const body: ApiErrorBody = { error: { code: m.code, message: m.message, requestId } };
  if (m.fields && Object.keys(m.fields).length > 0) body.error.fields = m.fields;
  if (res.headersSent) return;
  if (m.retryAfterSeconds !== undefined) res.setHeader('Retry-After', String(m.retryAfterSeconds));
  res.status(m.status).json(body);
};

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', 404, `There is no API route ${req.method} ${req.originalUrl.split('?')[0]}.`));
};
