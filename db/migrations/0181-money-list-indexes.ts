import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Indexes for the money lists at a busy workshop's scale (npm run seed:scale; EXPLAIN ANALYZE in
 * the README's performance notes):
 * - accounts' deposits page: the deposits received, newest first, and their totals, read from one
 *   narrow index of deposit payments instead of every payment;
 * - what a job has received (invoice list, aged debt, job balance): a job's payments with the
 *   columns summed, so the sum is an index-only read;
 * - the invoice list by state, newest number first;
 * - the payout that carried a refund (the ledger's refund rows).
 */
const INDEXES: [name: string, sql: string][] = [
  ['payments_deposits_received_idx', `payments (workshop_id, received_at DESC NULLS LAST, id) INCLUDE (state, currency, amount, fee, net) WHERE kind = 'deposit'`],
  ['payments_job_money_idx', `payments (job_id) INCLUDE (state, amount, refunded)`],
  ['invoices_workshop_state_seq_idx', `invoices (workshop_id, state, seq DESC)`],
  // The ledger's payout of a refund row.
  ['payout_transactions_refund_idx', `payout_transactions (refund_id) WHERE refund_id IS NOT NULL`],
];

export async function up({ context }: Ctx): Promise<void> {
  for (const [name, on] of INDEXES) await context.sequelize.query(`CREATE INDEX IF NOT EXISTS ${name} ON ${on}`);
}

export async function down({ context }: Ctx): Promise<void> {
  for (const [name] of INDEXES) await context.sequelize.query(`DROP INDEX IF EXISTS ${name}`);
}
