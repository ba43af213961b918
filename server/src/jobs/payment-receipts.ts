import { QueryTypes, type Transaction } from 'sequelize';
import { renderCreditNotePdf, renderInvoicePdf, renderReceiptPdf } from '../documents/index.js';
import { creditNoteMail, invoiceMail, receiptMail } from '../mail/invoice-mails.js';
import type { MailMessage, MailQueue } from '../mail/mail-queue.js';
import { AppError, notFound } from '../errors/app-error.js';
import { AuditEvent, CreditNote, Invoice, Job, Payment, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { lockJobById } from '../services/job-access.js';
import { receiptDocument } from '../services/invoices.service.js';
import type { Deps } from '../services/deps.js';

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
export const DOCUMENT_SWEEP_TASK = 'document-mail-sweep';
export type DocumentMailTask = { kind: 'invoice' | 'credit_note'; id: string };

/**
 * Queued once an invoice or credit note is committed: the worker renders its PDF and queues the
 * owner's e-mail. Should the process stop between the commit and this call, the sweep
 * (`sweepUnmailedDocuments`) finds the document by its empty `mailed_at` and queues it then.
 */
export async function queueDocumentMail(deps: Pick<Deps, 'mail'>, task: DocumentMailTask): Promise<void> {
  await deps.mail.enqueueTask(DOCUMENT_MAIL_TASK, task);
}

const DOCUMENT_TABLE = { invoice: 'invoices', credit_note: 'credit_notes' } as const;

/**
 * Tries of one document's e-mail before it is given up: our choice. The queue retries a failed try
 * with a doubling back-off from 15 s, and the sweep queues a document again every 10 minutes, so
 * eight tries span roughly half an hour to an hour: long enough for a renderer that was briefly
 * down, short enough that a PDF that can never be made is shown to staff the same day.
 */
export const DOCUMENT_MAIL_TRIES = 8;

/**
 * The owner's e-mail for an issued invoice or credit note, with its PDF. Idempotent, as receipts are:
 * the row's `mailed_at` is set in the same transaction that queues the e-mail, and only when it was
 * still empty, so a task that runs twice (a retry, the sweep beside the first task) sends one e-mail.
 * Each try is counted (committed before rendering, so a crash mid-render counts too). A rendering
 * failure throws, so the queue tries again later and the sweep after that, until the
 * DOCUMENT_MAIL_TRIES-th failure: then the document is marked given up (one warning in the log),
 * nothing retries it, and staff see "Not e-mailed" on it until they send it again.
 */
export async function sendDocumentMail(deps: Pick<Deps, 'mail' | 'logger'>, task: DocumentMailTask): Promise<'sent' | 'already' | 'no-email' | 'gone' | 'given-up'> {
  const table = DOCUMENT_TABLE[task.kind];
  const [state] = await boundSequelize().query<{ mailed: boolean; given_up: boolean }>(
    `SELECT mailed_at IS NOT NULL AS mailed, mail_given_up_at IS NOT NULL AS given_up FROM ${table} WHERE id = $1`,
    { bind: [task.id], type: QueryTypes.SELECT },
  );
  if (!state) return 'gone';
  if (state.mailed) return 'already';
  if (state.given_up) return 'given-up';
  const [tried] = await boundSequelize().query<{ mail_tries: number }>(
    `UPDATE ${table} SET mail_tries = mail_tries + 1 WHERE id = $1 AND mailed_at IS NULL AND mail_given_up_at IS NULL RETURNING mail_tries`,
    { bind: [task.id], type: QueryTypes.SELECT },
  );
  if (!tried) return 'already';
  let msg: MailMessage | null;
  let jobId: string;
  try {
    const row =
      task.kind === 'invoice'
        ? await Invoice.findByPk(task.id, { attributes: ['id', 'jobId', 'document'] })
        : await CreditNote.findByPk(task.id, { attributes: ['id', 'jobId', 'document'] });
    if (!row) return 'gone';
    jobId = row.jobId;
    // Rendered outside any transaction: a PDF takes far longer than a row lock should be held.
    msg =
      row instanceof Invoice
        ? row.document.customer.email
          ? invoiceMail(row.document, await renderInvoicePdf(row.document))
          : null
        : row.document.customer.email
          ? creditNoteMail(row.document, await renderCreditNotePdf(row.document))
          : null;
  } catch (err) {
    if (tried.mail_tries < DOCUMENT_MAIL_TRIES) throw err;
    const [gaveUp] = await boundSequelize().query(
      `UPDATE ${table} SET mail_given_up_at = now() WHERE id = $1 AND mailed_at IS NULL AND mail_given_up_at IS NULL RETURNING id`,
      { bind: [task.id], type: QueryTypes.SELECT },
    );
    if (gaveUp) deps.logger.warn({ ...task, tries: tried.mail_tries, err }, 'document e-mail given up: its PDF could not be made; staff can send it again');
    return 'given-up';
  }
  return inTransaction(async (t) => {
    await lockJobById(jobId, t);
    // Claims the e-mail: a second task waits on the row, then finds it already set.
    const [claimed] = (await boundSequelize().query(`UPDATE ${table} SET mailed_at = now() WHERE id = $1 AND mailed_at IS NULL AND mail_given_up_at IS NULL RETURNING id`, {
      bind: [task.id],
      transaction: t,
      type: QueryTypes.SELECT,
    })) as unknown[];
    if (!claimed) return 'already';
    if (msg) await deps.mail.enqueue(msg, t);
    else deps.logger.info({ ...task }, 'document not e-mailed: the owner has no e-mail address');
    return msg ? 'sent' : 'no-email';
  });
}

/**
 * Staff's "Resend" for a document not yet e-mailed (given up, or still waiting): its tries and
 * give-up mark are cleared, in the workshop's scope (another workshop's id is 404), and its task is
 * queued afresh once that commits. A document already e-mailed is refused: the owner has it.
 */
export async function resendDocumentMail(deps: Pick<Deps, 'mail'>, by: { workshopId: string; userId: string }, task: DocumentMailTask): Promise<void> {
  const { workshopId } = by;
  const table = DOCUMENT_TABLE[task.kind];
  const what = task.kind === 'invoice' ? 'That invoice' : 'That credit note';
  await inTransaction(async (t) => {
    const [row] = await boundSequelize().query<{ job_id: string; number: string; mailed: boolean }>(
      `SELECT job_id, number, mailed_at IS NOT NULL AS mailed FROM ${table} WHERE id = $1 AND workshop_id = $2 FOR UPDATE`,
      { bind: [task.id, workshopId], transaction: t, type: QueryTypes.SELECT },
    );
    if (!row) throw notFound(what);
    if (row.mailed) throw new AppError('conflict', 409, `${what} has already been e-mailed to the owner.`);
    await boundSequelize().query(`UPDATE ${table} SET mail_tries = 0, mail_given_up_at = NULL WHERE id = $1`, { bind: [task.id], transaction: t });
    await AuditEvent.create(
      {
        workshopId,
        jobId: row.job_id,
        actorUserId: by.userId,
        action: 'document.mail_resent',
        summary: `${task.kind === 'invoice' ? 'Invoice' : 'Credit note'} ${row.number} queued to be e-mailed to the owner again`,
        detail: { ...task },
      },
      { transaction: t },
    );
  });
  await queueDocumentMail(deps, task);
}

/**
 * Queues the e-mail of every invoice and credit note issued at least `olderThanMs` ago, not yet
 * mailed and not given up (at most `limit` a run; one workshop's when `workshopId` is given). Run on a schedule; the tasks it queues are the usual idempotent ones.
 */
export async function sweepUnmailedDocuments(
  deps: Pick<Deps, 'mail'>,
  { olderThanMs = 5 * 60_000, limit = 200, workshopId = null }: { olderThanMs?: number; limit?: number; workshopId?: string | null } = {},
): Promise<number> {
  const rows = await boundSequelize().query<{ kind: DocumentMailTask['kind']; id: string }>(
    `(SELECT 'invoice' AS kind, id, issued_at FROM invoices
       WHERE mailed_at IS NULL AND mail_given_up_at IS NULL AND issued_at <= now() - make_interval(secs => $1) AND ($3::uuid IS NULL OR workshop_id = $3))
     UNION ALL
     (SELECT 'credit_note' AS kind, id, issued_at FROM credit_notes
       WHERE mailed_at IS NULL AND mail_given_up_at IS NULL AND issued_at <= now() - make_interval(secs => $1) AND ($3::uuid IS NULL OR workshop_id = $3))
     ORDER BY issued_at LIMIT $2`,
    { bind: [olderThanMs / 1000, limit, workshopId], type: QueryTypes.SELECT },
  );
  for (const r of rows) await queueDocumentMail(deps, { kind: r.kind, id: r.id });
  return rows.length;
}

/** Starts the receipt and document workers on the mail queue's connection (their queues exist even where no worker runs). */
export async function startReceiptTasks(deps: Pick<Deps, 'mail' | 'logger'> & { mail: MailQueue }): Promise<void> {
  await deps.mail.workTask<{ paymentId: string }>(RECEIPT_TASK, async ({ paymentId }) => {
    const outcome = await sendPaymentReceipt(deps, paymentId);
    deps.logger.info({ paymentId, outcome }, 'payment receipt');
  });
  await deps.mail.workTask<DocumentMailTask>(DOCUMENT_MAIL_TASK, async (task) => {
    const outcome = await sendDocumentMail(deps, task);
    deps.logger.info({ ...task, outcome }, 'document e-mail');
  });
  // Every ten minutes, one process at a time: documents whose task was lost with a stopped process.
  await deps.mail.scheduleTask(DOCUMENT_SWEEP_TASK, '*/10 * * * *');
  await deps.mail.workTask<object>(DOCUMENT_SWEEP_TASK, async () => {
    const queued = await sweepUnmailedDocuments(deps);
    if (queued) deps.logger.warn({ queued }, 'documents issued but not yet mailed: queued again');
  });
}
