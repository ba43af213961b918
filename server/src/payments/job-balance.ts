import { QueryTypes, type Transaction } from 'sequelize';
import { Dec, assertInvoiceMove, formatAmount, minorUnits } from '@wingstage/shared';
import { Invoice, Job, boundSequelize } from '../models/index.js';
import { moveJob } from '../services/job-state.js';
import type { Scope } from '../services/scope.js';

/** States in which a payment's money is with the workshop (less what was refunded). */
export const MONEY_HELD_STATES = ['succeeded', 'partially_refunded'] as const;

export interface JobMoney {
  currency: string;
  /** Everything received on the job and kept: Σ (amount − refunded) of held payments. */
  received: string;
  /** The invoice's gross less every credit note against it; null before an invoice is issued. */
  invoiced: string | null;
  /** What the owner still owes on the invoice (never negative); null before an invoice. */
  due: string | null;
  /** Received beyond the invoice (to hand back or credit); "0.00" when none. */
  over: string;
}

/**
 * The job's money in one read: what was received (deposits and balance, card and offline) and what
 * the invoice, after credit notes, asks for. Both services that settle a job (card payments and
 * offline payments) read it through here so "paid" means one thing.
 */
export async function jobMoney(jobId: string, currency: string, t?: Transaction): Promise<JobMoney> {
  const sequelize = boundSequelize();
  const rows = await sequelize.query<{ received: string | null; invoiced: string | null }>(
    `SELECT
       (SELECT COALESCE(SUM(p.amount - p.refunded), 0)::text FROM payments p
         WHERE p.job_id = $1 AND p.state IN ('succeeded', 'partially_refunded')) AS received,
       (SELECT (i.gross - COALESCE((SELECT SUM(c.gross) FROM credit_notes c WHERE c.invoice_id = i.id), 0))::text
          FROM invoices i WHERE i.job_id = $1) AS invoiced`,
    { bind: [jobId], type: QueryTypes.SELECT, transaction: t },
  );
  const dp = minorUnits(currency);
  const received = new Dec(rows[0]?.received ?? '0');
  const invoicedRaw = rows[0]?.invoiced ?? null;
  const invoiced = invoicedRaw === null ? null : new Dec(invoicedRaw);
  const due = invoiced === null ? null : Dec.max(invoiced.minus(received), 0);
  const over = invoiced === null ? new Dec(0) : Dec.max(received.minus(invoiced), 0);
  return {
    currency,
    received: formatAmount(received, dp),
    invoiced: invoiced === null ? null : formatAmount(invoiced, dp),
    due: due === null ? null : formatAmount(due, dp),
    over: formatAmount(over, dp),
  };
}

/**
 * After money arrives (or a credit note lowers the invoice): when what is received covers the
 * invoice, the invoice becomes paid and the job moves invoiced → paid through the state machines,
 * with a history entry. Call it inside the transaction that wrote the payment, with the job row
 * locked (lock order: job first). Returns true when it moved something.
 */
export async function settleJobIfCovered(scope: Scope | null, jobId: string, t: Transaction): Promise<boolean> {
  const invoice = await Invoice.findOne({ where: { jobId }, transaction: t, lock: t.LOCK.UPDATE });
  if (!invoice || invoice.state !== 'issued') return false;
  const money = await jobMoney(jobId, invoice.currency, t);
  if (money.due === null || !new Dec(money.due).isZero()) return false;
  assertInvoiceMove(invoice.state, 'paid');
  await invoice.update({ state: 'paid', paidAt: new Date() }, { transaction: t });
  const job = await Job.findByPk(jobId, { transaction: t, lock: t.LOCK.UPDATE });
  if (job && job.state === 'invoiced') {
    await moveJob(scope, job, 'paid', `invoice ${invoice.number} paid in full (${money.received} received)`, t);
  }
  return true;
}
