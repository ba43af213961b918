import type { Transaction, TransactionOptions } from 'sequelize';
import { busyRecord } from '../errors/app-error.js';
import { boundSequelize } from '../models/index.js';
import { isTransactionCollision } from './db-errors.js';

/**
 * Runs `work` in one database transaction. If PostgreSQL stops it as one side of a deadlock or a
 * serialization failure, everything it did was rolled back, so it is run once more from the start;
 * a second collision is answered 409 with a plain reason instead of a 500.
 *
 * `work` must keep its effects inside the transaction (rows, queued mail) so that running it again
 * is safe. The lock order that makes collisions rare is written down in DEVELOPERS.md ("Locks").
 */
export async function inTransaction<T>(work: (t: Transaction) => Promise<T>, options: TransactionOptions = {}): Promise<T> {
  try {
    return await boundSequelize().transaction(options, work);
  } catch (err) {
    if (!isTransactionCollision(err)) throw err;
  }
  try {
    return await boundSequelize().transaction(options, work);
  } catch (err) {
    if (isTransactionCollision(err)) throw busyRecord();
    throw err;
  }
}
