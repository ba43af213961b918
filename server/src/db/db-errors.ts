import { ConnectionError } from 'sequelize';

/** The PostgreSQL SQLSTATE of an error, wherever Sequelize or pg put it. */
export function sqlState(err: unknown): string | undefined {
  const e = err as { parent?: { code?: unknown }; original?: { code?: unknown }; code?: unknown } | null;
  const code = e?.parent?.code ?? e?.original?.code ?? e?.code;
  return typeof code === 'string' ? code : undefined;
}

/** 40P01 deadlock_detected, 40001 serialization_failure: PostgreSQL stopped one of two colliding transactions; running it again usually works. */
export function isTransactionCollision(err: unknown): boolean {
  const code = sqlState(err);
  return code === '40P01' || code === '40001';
}

/** SQLSTATEs of a server going away or refusing connections (class 08, admin/crash shutdown, starting up, too many clients). */
const UNAVAILABLE_STATES = new Set(['57P01', '57P02', '57P03', '53300', '08000', '08001', '08003', '08004', '08006']);
/** Socket errors of a database that is not there (or not yet back). */
const SOCKET_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'EPIPE', 'ENOTFOUND', 'EHOSTUNREACH']);
const GONE_MESSAGES = /Connection terminated|connection is closed|Client has encountered a connection error|terminating connection|the database system is (starting up|shutting down)/i;

/**
 * True when the database could not be reached or dropped the connection: the request did nothing
 * wrong and the same request should work once PostgreSQL is back. Sequelize's own ConnectionError
 * family covers a refused connection and a pool that could not hand one out in time.
 */
export function isDatabaseUnavailable(err: unknown): boolean {
  if (err instanceof ConnectionError) return true;
  const code = sqlState(err);
  if (code && (UNAVAILABLE_STATES.has(code) || SOCKET_CODES.has(code))) return true;
  const e = err as { message?: unknown; parent?: { message?: unknown } } | null;
  const message = `${typeof e?.message === 'string' ? e.message : ''} ${typeof e?.parent?.message === 'string' ? e.parent.message : ''}`;
  return GONE_MESSAGES.test(message);
}
