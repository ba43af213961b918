import { availableParallelism } from 'node:os';
import bcrypt from 'bcryptjs';
import { Piscina } from 'piscina';
import { AppError } from '../errors/app-error.js';

/**
 * OWASP Password Storage Cheat Sheet: bcrypt with a work factor of at least 10; we use 12.
 * Input above 72 bytes is refused by the shared passwordSchema, never truncated.
 */
export const BCRYPT_COST = 12;

/**
 * A bcrypt hash (cost 12) of a random value nobody knows. An unknown e-mail is checked against it,
 * so a miss costs the same time as a wrong password and timing does not reveal who has a sign-in.
 */
const DUMMY_HASH = '$2b$12$xv3OhOUoHvTsKhkG6Vy3KuUY4qciFMFjrTMp2wBxK/r9TmOob3vVK';

/** Hashes on the calling thread: for scripts (seeding, demo users) and tests, never for a request. */
export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export interface PasswordPoolOptions {
  /** Worker threads hashing at once. */
  threads: number;
  /** Passwords that may wait for a thread; past that a request is told to come back (503 + Retry-After). */
  queue: number;
}

/** One thread fewer than the machine has, so requests always keep a core; at least one. */
export const defaultPasswordThreads = () => Math.max(1, availableParallelism() - 1);

const busy = () =>
  new AppError('unavailable', 503, 'Signing in is busy right now. Please try again in a few seconds.', undefined, 5);

/**
 * Password hashing and checking off the request thread, in a small pool of worker threads
 * (piscina) with a bounded queue: a burst of sign-ins waits its turn or is turned away at once,
 * and never holds up anyone else's request.
 */
export class PasswordHasher {
  private readonly pool: Piscina;
  /** Passwords actually compared so far (probes and tests read it: throttling must stop guesses before this). */
  checked = 0;

  private readonly maxQueue: number;
  private readonly threads: number;

  constructor(opts: PasswordPoolOptions) {
    this.maxQueue = opts.queue;
    this.threads = opts.threads;
    this.pool = new Piscina({
      filename: new URL('./password-worker.mjs', import.meta.url).href,
      minThreads: 1,
      maxThreads: opts.threads,
      maxQueue: opts.queue,
      idleTimeout: 60_000,
    });
  }

  private async run<T>(task: object): Promise<T> {
    try {
      return (await this.pool.run(task)) as T;
    } catch (err) {
      if (err instanceof Error && /queue is at limit/i.test(err.message)) throw busy();
      throw err;
    }
  }

  /** True only for a stored hash that matches. No hash (unknown e-mail, no password yet) still costs one comparison. */
  async check(password: string, hash: string | null | undefined): Promise<boolean> {
    const matches = await this.run<boolean>({ op: 'compare', password, hash: hash || DUMMY_HASH });
    this.checked += 1;
    return Boolean(hash) && matches;
  }

  hash(password: string): Promise<string> {
    return this.run<string>({ op: 'hash', password, cost: BCRYPT_COST });
  }

  private admitted = 0;

  /**
   * Admits one sign-in before any of its database work, or turns it away at once (503) when as
   * many are already under way as the threads and the queue hold. Counting from the start, not
   * from the pool's queue, keeps a burst's overflow from queueing for database connections too.
   * Call the returned function when the sign-in is over.
   */
  admit(): () => void {
    if (this.admitted >= this.threads + this.maxQueue) throw busy();
    this.admitted += 1;
    let done = false;
    return () => {
      if (done) return;
      done = true;
      this.admitted -= 1;
    };
  }

  /** Passwords waiting for a thread right now. */
  get waiting(): number {
    return this.pool.queueSize;
  }

  async close(): Promise<void> {
    await this.pool.destroy();
  }
}
