import { renderReceiptPdf } from '../documents/index.js';
import { receiptMail } from '../mail/invoice-mails.js';
import type { MailQueue } from '../mail/mail-queue.js';
import { Job, Payment } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { lockJobById } from '../services/job-access.js';
import { receiptDocument } from '../services/invoices.service.js';
import type { Deps } from '../services/deps.js';
import type { Transaction } from 'sequelize';

export const CARD_RECEIPT_TASK = 'card-receipt';

/** Queued in the transaction that records a card payment as received; the worker renders and sends. */
export async function queueCardReceipt(deps: Pick<Deps, 'mail'>, paymentId: string, t: Transaction): Promise<void> {
  await deps.mail.enqueueTask(CARD_RECEIPT_TASK, { paymentId }, t);
}

/**
 * The owner's receipt for a card payment (deposit or balance), with its PDF. Idempotent: the
 * payment row remembers that its receipt was queued, set in the same transaction that queues the
 * e-mail, so a task that runs twice (a retry after a crash) sends one e-mail.
 */
export async function sendCardReceipt(deps: Pick<Deps, 'mail' | 'logger'>, paymentId: string): Promise<'sent' | 'already' | 'no-email' | 'gone'> {
  const payment = await Payment.findByPk(paymentId);
  if (!payment || payment.amount === null || payment.state === 'pending' || payment.state === 'failed' || payment.state === 'cancelled') return 'gone';
  if (payment.receiptMailedAt) return 'already';
  const job = await Job.findByPk(payment.jobId);
  if (!job) return 'gone';
  // Rendered outside any transaction: a PDF takes far longer than a row lock should be held.
  const doc = await receiptDocument(payment, job);
  const msg = doc.customer.email ? receiptMail(doc, await renderReceiptPdf(doc)) : null;
  return inTransaction(async (t) => {
    await lockJobById(payment.jobId, t);
    const p = await Payment.findByPk(paymentId, { transaction: t, lock: t.LOCK.UPDATE });
    if (!p || p.receiptMailedAt) return 'already';
    if (msg) await deps.mail.enqueue(msg, t);
    await p.update({ receiptMailedAt: new Date() }, { transaction: t });
    if (!msg) deps.logger.info({ paymentId }, 'card receipt not e-mailed: the owner has no e-mail address');
    return msg ? 'sent' : 'no-email';
  });
}

/** Starts the receipt worker on the mail queue's connection (its queue exists even where no worker runs). */
export async function startCardReceipts(deps: Pick<Deps, 'mail' | 'logger'> & { mail: MailQueue }): Promise<void> {
  await deps.mail.workTask<{ paymentId: string }>(CARD_RECEIPT_TASK, async ({ paymentId }) => {
    const outcome = await sendCardReceipt(deps, paymentId);
    deps.logger.info({ paymentId, outcome }, 'card receipt');
  });
}
