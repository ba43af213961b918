import { createHash } from 'node:crypto';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import type { Sequelize } from 'sequelize';
import type { Config } from '../config/config.js';
import { AppError } from '../errors/app-error.js';

/** Every limit counts over the same window. */
export const WINDOW_MINUTES = 15;

/**
 * One counter per key in the shared `rate_limits` table (migration 0060), through
 * rate-limiter-flexible's PostgreSQL store: each attempt is one atomic upsert, so any number of app
 * processes on one database count together, and parallel requests cannot slip past the limit.
 */
export class Limiter {
  constructor(
    private readonly store: RateLimiterPostgres,
    readonly limit: number,
  ) {}

  /**
   * Takes one attempt from the key's allowance before the work is done. Null when allowed; the
   * seconds to wait when the allowance is used up (the refused attempt is not counted again).
   */
  async reserve(id: string): Promise<number | null> {
    try {
      await this.store.consume(id, 1);
      return null;
    } catch (err) {
      if (err instanceof RateLimiterRes) {
        // consume() added the refused point too; give it back so waiting out the window is enough.
        if (err.consumedPoints > this.limit) await this.store.reward(id, 1);
        return Math.max(1, Math.ceil(err.msBeforeNext / 1000));
      }
      throw err;
    }
  }

  /** Counts one failure after the fact (for limits that count only failures). */
  async count(id: string): Promise<void> {
    await this.store.penalty(id, 1);
  }

  /** Gives back an attempt that was reserved but never made (the work was refused for another reason). */
  async refund(id: string): Promise<void> {
    await this.store.reward(id, 1);
  }

  /** Seconds to wait when the key has no allowance left, else null; changes nothing. */
  async blocked(id: string): Promise<number | null> {
    const res = await this.store.get(id);
    if (!res || res.consumedPoints < this.limit) return null;
    return Math.max(1, Math.ceil(res.msBeforeNext / 1000));
  }

  /** Forgets the key's attempts (a right password, a completed reset). */
  async reset(id: string): Promise<void> {
    await this.store.delete(id);
  }
}

export interface RateLimits {
  /** Sign-in attempts per account (SIGNIN_ACCOUNT_LIMIT), reserved before the password is checked. */
  signInAccount: Limiter;
  /** Requests per address to sign-in, password reset and invitations (SIGNIN_ADDRESS_LIMIT). */
  authAddress: Limiter;
  /** Failed decision-link look-ups per address (DECIDE_ADDRESS_LIMIT); links that work never count. */
  decideAddress: Limiter;
}

type LimitConfig = Pick<Config, 'SIGNIN_ACCOUNT_LIMIT' | 'SIGNIN_ADDRESS_LIMIT' | 'DECIDE_ADDRESS_LIMIT' | 'RATE_LIMIT_NAMESPACE'>;

export function createRateLimits(sequelize: Sequelize, config: LimitConfig): RateLimits {
  const limiter = (kind: string, points: number) =>
    new Limiter(
      new RateLimiterPostgres({
        storeClient: sequelize,
        storeType: 'sequelize',
        tableName: 'rate_limits',
        tableCreated: true,
        keyPrefix: `${config.RATE_LIMIT_NAMESPACE}:${kind}`,
        points,
        duration: WINDOW_MINUTES * 60,
      }),
      points,
    );
  return {
    signInAccount: limiter('sign-in-account', config.SIGNIN_ACCOUNT_LIMIT),
    authAddress: limiter('auth-address', config.SIGNIN_ADDRESS_LIMIT),
    decideAddress: limiter('decide-address', config.DECIDE_ADDRESS_LIMIT),
  };
}

/** An account's key: a hash of its e-mail, so the table holds no addresses and no key outgrows its column. */
export const accountKey = (email: string): string => createHash('sha256').update(email.trim().toLowerCase()).digest('hex');

export const tooManyFromAddress = (retryAfterSeconds: number) =>
  new AppError('too_many_requests', 429, `Too many attempts from this address. Wait ${WINDOW_MINUTES} minutes and try again.`, undefined, retryAfterSeconds);

/** Counts every request from the address, before it is handled. */
export function perAddress(limiter: Limiter): RequestHandler {
  return async (req, _res, next) => {
    const wait = await limiter.reserve(req.ip ?? '');
    if (wait !== null) throw tooManyFromAddress(wait);
    next();
  };
}

/**
 * Limits look-ups that found nothing (404) per address: `check` goes before the routes and refuses
 * an address that has used up its allowance; `countFailure` goes after them, as the router's error
 * middleware, and counts a not-found before the answer is sent (so the next request already sees
 * it). Pages and photos that load never count, so the owner's own link keeps working however often
 * it is opened. Parallel guesses can pass `check` together, so a burst may overrun by its own size.
 */
export function failedLookupsPerAddress(limiter: Limiter): { check: RequestHandler; countFailure: ErrorRequestHandler } {
  return {
    check: async (req, _res, next) => {
      const wait = await limiter.blocked(req.ip ?? '');
      if (wait !== null) throw tooManyFromAddress(wait);
      next();
    },
    countFailure: async (err, req, _res, next) => {
      if (err instanceof AppError && err.status === 404) await limiter.count(req.ip ?? '');
      next(err);
    },
  };
}
