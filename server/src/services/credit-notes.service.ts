import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  Dec,
  assertPaymentMove,
  creditNoteAmounts,
  formatAmount,
  formatMoney,
  minorUnits,
  toMinorUnits,
  type CreditNoteDocument,
  type CreditNoteDto,
  type CreditNoteSummaryDto,
  type DocumentEmailState,
  type DocumentRateTotal,
  type Page,
  type creditNoteListQuerySchema,
  type creditNoteSchema,
  type refundSchema,
} from '@wingstage/shared';
import { AppError, conflict, notFound } from '../errors/app-error.js';
import { CreditNote, Invoice, Payment, Refund, Workshop, boundSequelize } from '../models/index.js';
import { inTransaction } from '../db/transaction.js';
import { settleJobIfCovered } from '../payments/job-balance.js';
import { stripeClient } from '../payments/stripe-client.js';
import { recordAudit } from './audit.js';
import type { Deps } from './deps.js';
import { creditInvoiceIfCleared, partiesOf, supplierOf, takeNumber, ukDate } from './invoices.service.js';
import { lockJob } from './job-access.js';
import { requireStaff, type Scope } from './scope.js';
import { scopedMoneyFilter } from './list-helpers.js';

/** A bind parameter's placeholder in SQL text: $1, $2, … */
const arg = (n: number) => '$' + String(n);

type ListQuery = z.output<typeof creditNoteListQuerySchema>;
type GoodwillInput = z.output<typeof creditNoteSchema>;
type RefundInput = z.output<typeof refundSchema>;

interface CreditRow {
  id: string;
  number: string;
  invoice_id: string;
  invoice_number: string;
  job_id: string;
  job_number: string;
  customer_name: string;
  issued_at: Date;
  reason: string;
  net: string;
  vat: string;
  gross: string;
  currency: string;
  refunded: string | null;
  email: DocumentEmailState;
  total: string;
}

async function creditRows(scope: Scope, where: string[], bind: unknown[], page?: { limit: number; offset: number }): Promise<CreditRow[]> {
  const { conds, params } = scopedMoneyFilter(scope, 'cn.workshop_id', where, bind);
  const paging = page ? ` LIMIT ${page.limit} OFFSET ${page.offset}` : '';
  return boundSequelize().query<CreditRow>(
    `SELECT cn.id, cn.number, cn.invoice_id, i.number AS invoice_number, cn.job_id, j.number AS job_number, c.name AS customer_name,
            cn.issued_at, cn.reason, cn.net::text AS net, cn.vat::text AS vat, cn.gross::text AS gross, i.currency,
            (SELECT SUM(r.amount)::text FROM refunds r WHERE r.credit_note_id = cn.id AND r.state <> 'failed') AS refunded,
            CASE WHEN cn.mailed_at IS NOT NULL THEN 'done' WHEN cn.mail_given_up_at IS NOT NULL THEN 'not_sent' ELSE 'waiting' END AS email,
            COUNT(*) OVER ()::text AS total
       FROM credit_notes cn JOIN invoices i ON i.id = cn.invoice_id JOIN jobs j ON j.id = cn.job_id
       JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
      WHERE ${conds.join(' AND ')}
      ORDER BY cn.seq DESC${paging}`,
    { bind: params, type: QueryTypes.SELECT },
  );
}

const summaryOf = (r: CreditRow, scope: Scope): CreditNoteSummaryDto => ({
  id: r.id,
  number: r.number,
  invoiceId: r.invoice_id,
  invoiceNumber: r.invoice_number,
  jobId: r.job_id,
  jobNumber: r.job_number,
  customerName: r.customer_name,
  issuedOn: ukDate(new Date(r.issued_at)),
  reason: r.reason,
  currency: r.currency,
  net: r.net,
  vat: r.vat,
  gross: r.gross,
  refunded: r.refunded,
  email: scope.role === 'owner' ? null : r.email,
});

export async function creditNoteSummaries(scope: Scope, f: { invoiceId: string }): Promise<CreditNoteSummaryDto[]> {
  return (await creditRows(scope, ['cn.invoice_id = $2'], [f.invoiceId])).map((r) => summaryOf(r, scope));
}

export async function listCreditNotes(scope: Scope, q: ListQuery): Promise<Page<CreditNoteSummaryDto>> {
  requireStaff(scope);
  const where: string[] = [];
  const bind: unknown[] = [];
  const add = (sql: (n: number) => string, v: unknown) => {
    bind.push(v);
    where.push(sql(bind.length + 1));
  };
  if (q.jobId) add((n) => `cn.job_id = ${arg(n)}`, q.jobId);
  if (q.invoiceId) add((n) => `cn.invoice_id = ${arg(n)}`, q.invoiceId);
  if (q.customerId) add((n) => `a.customer_id = ${arg(n)}`, q.customerId);
  if (q.from) add((n) => `cn.tax_point >= ${arg(n)}::date`, q.from);
  if (q.to) add((n) => `cn.tax_point <= ${arg(n)}::date`, q.to);
  if (q.q) add((n) => `(cn.number ILIKE ${arg(n)} OR i.number ILIKE ${arg(n)} OR c.name ILIKE ${arg(n)})`, `%${q.q.replace(/[%_\\]/g, '\\$&')}%`);
  const rows = await creditRows(scope, where, bind, { limit: q.pageSize, offset: (q.page - 1) * q.pageSize });
  return { items: rows.map((r) => summaryOf(r, scope)), total: rows[0] ? Number(rows[0].total) : 0, page: q.page, pageSize: q.pageSize };
}

export async function getCreditNote(scope: Scope, id: string): Promise<CreditNoteDto> {
  const [row] = await creditRows(scope, ['cn.id = $2'], [id]);
  if (!row) throw notFound('That credit note');
  const cn = await CreditNote.findByPk(row.id);
  if (!cn) throw notFound('That credit note');
  return { ...summaryOf(row, scope), document: cn.document };
}

/** The invoice by id in the caller's workshop, its job locked first (lock order: job, then its rows). */
async function lockInvoice(scope: Scope, invoiceId: string, t: Transaction): Promise<Invoice> {
  const found = await Invoice.findOne({ where: { id: invoiceId, workshopId: scope.workshopId }, attributes: ['jobId'], transaction: t });
  if (!found) throw notFound('That invoice');
  await lockJob(scope, found.jobId, t);
  const invoice = await Invoice.findByPk(invoiceId, { transaction: t, lock: t.LOCK.UPDATE });
  if (!invoice) throw notFound('That invoice');
  return invoice;
}

async function creditedByRate(invoiceId: string, t: Transaction): Promise<DocumentRateTotal[]> {
  const earlier = await CreditNote.findAll({ where: { invoiceId }, attributes: ['document'], transaction: t });
  return earlier.flatMap((c) => c.document.byRate);
}

const amountRefused = (message: string) => new AppError('invalid_amount', 422, message, { amount: message });

/** Refuses a reduction above what is still on the invoice; returns what earlier credit notes took per rate. */
async function assertCreditable(invoice: Invoice, gross: string, t: Transaction): Promise<DocumentRateTotal[]> {
  const earlier = await creditedByRate(invoice.id, t);
  const creditedGross = earlier.reduce((a, r) => a.plus(r.net).plus(r.vat), new Dec(0));
  const creditable = new Dec(invoice.gross).minus(creditedGross);
  if (new Dec(gross).greaterThan(creditable)) {
    throw amountRefused(`A credit note cannot be more than the ${formatMoney(formatAmount(creditable, minorUnits(invoice.currency)), invoice.currency)} still on invoice ${invoice.number}.`);
  }
  return earlier;
}

/** Writes the credit note (own gap-free number) for `gross` against the invoice, inside the caller's transaction. */
async function writeCreditNote(
  scope: Scope,
  invoice: Invoice,
  gross: string,
  reason: string,
  refund: CreditNoteDocument['refund'],
  t: Transaction,
): Promise<CreditNote> {
  const earlier = await assertCreditable(invoice, gross, t);
  const amounts = creditNoteAmounts(invoice.document.byRate, earlier, gross, invoice.currency, reason);
  const w = await Workshop.findByPk(scope.workshopId, { transaction: t });
  if (!w) throw notFound('The workshop');
  const job = await lockJob(scope, invoice.jobId, t);
  const parties = await partiesOf(job, t);
  const { seq, number } = await takeNumber(scope.workshopId, 'credit_note', t);
  const issuedOn = ukDate(new Date());
  const document: CreditNoteDocument = {
    version: 1,
    kind: 'credit_note',
    number,
    issuedOn,
    taxPoint: issuedOn,
    invoice: { number: invoice.number, issuedOn: invoice.document.issuedOn },
    supplier: supplierOf(w),
    customer: parties.customer,
    job: parties.job,
    currency: invoice.currency,
    reason,
    lines: amounts.lines,
    byRate: amounts.byRate,
    totals: amounts.totals,
    refund,
    notes: [
      `This credit note reduces invoice ${invoice.number} of ${invoice.document.issuedOn} by ${formatMoney(amounts.totals.gross, invoice.currency)}, of which VAT ${formatMoney(amounts.totals.vat, invoice.currency)}.`,
      ...(refund ? [`${formatMoney(refund.amount, invoice.currency)} is being refunded to the card it was paid with.`] : []),
    ],
  };
  const cn = await CreditNote.create(
    {
      workshopId: scope.workshopId,
      jobId: invoice.jobId,
      invoiceId: invoice.id,
      seq,
      number,
      taxPoint: issuedOn,
      reason,
      net: amounts.totals.net,
      vat: amounts.totals.vat,
      gross: amounts.totals.gross,
      document,
      issuedBy: scope.userId,
    },
    { transaction: t },
  );
  await recordAudit(scope, t, {
    jobId: invoice.jobId,
    action: 'credit_note.issued',
    summary: `Credit note ${number} against invoice ${invoice.number}: ${formatMoney(amounts.totals.gross, invoice.currency)} incl. VAT${refund ? `, refunded to the card` : ', no refund'} (${reason})`,
    detail: { creditNoteId: cn.id, number, invoiceId: invoice.id, gross: amounts.totals.gross, vat: amounts.totals.vat, refund: refund?.amount ?? null },
  });
  return cn;
}

/** A credit note without a refund (a goodwill reduction): lowers what the owner owes. */
export async function issueGoodwillCreditNote(scope: Scope, invoiceId: string, input: GoodwillInput): Promise<CreditNoteDto> {
  requireStaff(scope);
  const id = await inTransaction((t) => issueGoodwillCreditNoteIn(scope, invoiceId, input, t));
  return getCreditNote(scope, id);
}

/** The same inside the caller's transaction; returns the credit note's id. */
export async function issueGoodwillCreditNoteIn(scope: Scope, invoiceId: string, input: GoodwillInput, t: Transaction): Promise<string> {
  const invoice = await lockInvoice(scope, invoiceId, t);
  const cn = await writeCreditNote(scope, invoice, input.amount, input.reason, null, t);
  await creditInvoiceIfCleared(invoice.id, t);
  // The reduction may leave what was received covering the rest.
  await settleJobIfCovered(scope, invoice.jobId, t);
  return cn.id;
}

/**
 * A full or partial refund of a card payment through the processor, always with a credit note.
 * The processor is asked inside the transaction that holds the job: if it refuses, nothing is
 * written and no number is taken; if it agrees, the refund, the payment and the credit note are
 * written together (the `charge.refunded` event then finds them up to date).
 */
export async function refundPayment(scope: Scope, deps: Pick<Deps, 'config'>, invoiceId: string, input: RefundInput): Promise<CreditNoteDto> {
  requireStaff(scope);
  const id = await inTransaction(async (t) => {
    const invoice = await lockInvoice(scope, invoiceId, t);
    const payment = await Payment.findOne({ where: { id: input.paymentId, jobId: invoice.jobId, workshopId: scope.workshopId }, transaction: t, lock: t.LOCK.UPDATE });
    if (!payment) throw notFound('That payment');
    if (payment.method !== 'card' || !payment.stripePaymentIntentId || payment.amount === null) {
      throw conflict('Only a card payment can be refunded here. Money paid another way is handed back outside Wingstage; issue a credit note for it.');
    }
    const dp = minorUnits(payment.currency);
    const left = new Dec(payment.amount).minus(payment.refunded);
    if (new Dec(input.amount).greaterThan(left)) {
      throw amountRefused(`That is more than the ${formatMoney(formatAmount(left, dp), payment.currency)} that can still be refunded on this payment.`);
    }
    const after = new Dec(payment.refunded).plus(input.amount);
    const to = after.equals(payment.amount) ? 'refunded' : 'partially_refunded';
    assertPaymentMove(payment.state, to);
    const refund = await Refund.create(
      {
        workshopId: scope.workshopId,
        jobId: invoice.jobId,
        paymentId: payment.id,
        amount: input.amount,
        currency: payment.currency,
        reason: input.reason,
        createdBy: scope.userId,
      },
      { transaction: t },
    );
    await assertCreditable(invoice, input.amount, t);
    // Asked before the credit note's number is taken, so the counter row is never held across the call.
    const r = await stripeClient(deps.config).refunds.create(
      {
        payment_intent: payment.stripePaymentIntentId,
        amount: toMinorUnits(input.amount, payment.currency),
        reason: 'requested_by_customer',
        metadata: { refund_id: refund.id, workshop_id: scope.workshopId },
      },
      { idempotencyKey: `refund-${refund.id}` },
    );
    const cn = await writeCreditNote(scope, invoice, input.amount, input.reason, { amount: input.amount, method: 'card', paymentId: payment.id }, t);
    await refund.update(
      {
        creditNoteId: cn.id,
        stripeRefundId: r.id,
        stripeBalanceTransactionId: typeof r.balance_transaction === 'string' ? r.balance_transaction : (r.balance_transaction?.id ?? null),
        state: r.status === 'succeeded' ? 'succeeded' : r.status === 'failed' ? 'failed' : 'pending',
      },
      { transaction: t },
    );
    await payment.update({ refunded: formatAmount(after, dp), state: to }, { transaction: t });
    await recordAudit(scope, t, {
      jobId: invoice.jobId,
      action: 'payment.refunded',
      summary: `Refund of ${formatMoney(input.amount, payment.currency)} to the card (payment ${payment.id.slice(0, 8)}), with credit note ${cn.number}`,
      detail: { refundId: refund.id, paymentId: payment.id, amount: input.amount, creditNoteId: cn.id, stripeRefundId: r.id },
    });
    await creditInvoiceIfCleared(invoice.id, t);
    return cn.id;
  });
  return getCreditNote(scope, id);
}
