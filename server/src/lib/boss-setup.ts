import { setTimeout as sleep } from 'node:timers/promises';

/** PostgreSQL's codes for a deadlock and a serialisation failure: safe to try again. */
const RETRYABLE = new Set(['40P01', '40001']);

/**
 * pg-boss creates each queue as a partition of its job table (DDL), and schedules as rows. Several
 * app processes (or test servers) starting at once can deadlock on that DDL; PostgreSQL then aborts
 * one of them. Queue set-up is idempotent, so the loser simply tries again after a short random wait.
 */
export async function bossSetUp<T>(step: () => Promise<T>, tries = 6): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await step();
    } catch (err) {
      const code = (err as { code?: unknown }).code;
      if (attempt >= tries || typeof code !== 'string' || !RETRYABLE.has(code)) throw err;
      await sleep(50 + Math.floor(Math.random() * 200 * attempt));
    }
  }
}
