import { renderReceiptPdf } from '../documents/index.js';
import { receiptMail, sendCreditNoteMail, sendInvoiceMail } from '../mail/invoice-mails.js';
import type { MailQueue } from '../mail/mail-queue.js';
import { CreditNote, Invoice, Job, Payment } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { lockJobById } from '../services/job-access.js';
import { receiptDocument } from '../services/invoices.service.js';
import type { Deps } from '../services/deps.js';
import type { Transaction } from 'sequelize';

export const RECEIPT_TASK = 'receipt';

/**
 * Queued in the transaction that records a card payment as received (or after an offline payment is
 * committed); the worker renders and sends, so no request or webhook waits for a PDF.
 */
export async function queuePaymentReceipt(deps: Pick<Deps, 'mail'>, paymentId: string, t?: Transaction): Promise<void> {
  await deps.mail.enqueueTask(RECEIPT_TASK, { paymentId }, t);
}

/**
 * The owner's receipt for a payment received (card deposit or balance, or offline), with its PDF. Idempotent: the
 * payment row remembers that its receipt was queued, set in the same transaction that queues the
 * e-mail, so a task that runs twice (a retry after a crash) sends one e-mail.
 */
export async function sendPaymentReceipt(deps: Pick<Deps, 'mail' | 'logger'>, paymentId: string): Promise<'sent' | 'already' | 'no-email' | 'gone'> {
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
    if (!msg) deps.logger.info({ paymentId }, 'receipt not e-mailed: the owner has no e-mail address');
    return msg ? 'sent' : 'no-email';
  });
}

export const DOCUMENT_MAIL_TASK = 'document-mail';
type DocumentMailTask = { kind: 'invoice' | 'credit_note'; id: string };

/** Queued once an invoice or credit note is committed: the worker renders its PDF and queues the owner's e-mail. */
export async function queueDocumentMail(deps: Pick<Deps, 'mail'>, task: DocumentMailTask): Promise<void> {
  await deps.mail.enqueueTask(DOCUMENT_MAIL_TASK, task);
}

async function sendDocumentMail(deps: Pick<Deps, 'mail' | 'logger'>, task: DocumentMailTask): Promise<void> {
  if (task.kind === 'invoice') {
    const inv = await Invoice.findByPk(task.id, { attributes: ['id', 'document'] });
    if (inv) await sendInvoiceMail(deps, inv.document);
  } else {
    const cn = await CreditNote.findByPk(task.id, { attributes: ['id', 'document'] });
    if (cn) await sendCreditNoteMail(deps, cn.document);
  }
}

/** Starts the receipt and document workers on the mail queue's connection (their queues exist even where no worker runs). */
export async function startReceiptTasks(deps: Pick<Deps, 'mail' | 'logger'> & { mail: MailQueue }): Promise<void> {
  await deps.mail.workTask<{ paymentId: string }>(RECEIPT_TASK, async ({ paymentId }) => {
    const outcome = await sendPaymentReceipt(deps, paymentId);
    deps.logger.info({ paymentId, outcome }, 'payment receipt');
  });
  await deps.mail.workTask<DocumentMailTask>(DOCUMENT_MAIL_TASK, (task) => sendDocumentMail(deps, task));
}
