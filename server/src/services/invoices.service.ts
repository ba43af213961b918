import { QueryTypes, type Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  formatCalendarDate,
  Dec,
  JOB_STATE_LABELS,
  assertInvoiceMove,
  assertPaymentMove,
  buildInvoiceDocument,
  formatMoney,
  minorUnits,
  formatAmount,
  priceEstimate,
  estimateEngineInput,
  workshopSettingsSchema,
  type DocumentJob,
  type DocumentParty,
  type DocumentSupplier,
  type InvoiceDocument,
  type InvoiceDto,
  type InvoicePaymentDto,
  type InvoicePreviewDto,
  type InvoiceSummaryDto,
  type DocumentEmailState,
  type JobState,
  type Page,
  type ReceiptDocument,
  PAYMENT_METHOD_LABELS,
  type invoiceIssueSchema,
  type invoiceListQuerySchema,
  type offlinePaymentSchema,
  calendarDateOf,
} from '@wingstage/shared';
import { AppError, conflict, notFound } from '../errors/app-error.js';
import { Aircraft, Customer, DepositRequest, Finding, Invoice, Payment, Workshop, boundSequelize } from '../models/index.js';
import { depositVat } from '../accounts/vat-summary.js';
import { inTransaction } from '../db/transaction.js';
import { jobMoney, settleJobIfCovered } from '../payments/job-balance.js';
import { recordAudit } from './audit.js';
import { loadLines } from './estimates.service.js';
import { findJob, lockJob, type JobRow } from './job-access.js';
import { moveJob } from './job-state.js';
import { pricingOf } from './pricing.js';
import { requireStaff, type Scope } from './scope.js';
import { creditNoteSummaries } from './credit-notes.service.js';
import { scopedMoneyFilter } from './list-helpers.js';

type IssueInput = z.output<typeof invoiceIssueSchema>;
/** A bind parameter's placeholder in SQL text: $1, $2, … */
const arg = (n: number) => '$' + String(n);

type ListQuery = z.output<typeof invoiceListQuerySchema>;
type OfflineInput = z.output<typeof offlinePaymentSchema>;

/** The calendar date in the UK (VAT dates are UK dates), as YYYY-MM-DD. */
export function ukDate(d: Date): string {
  return calendarDateOf(d, 'Europe/London');
}

export function addDays(iso: string, days: number): string {
  const d = new Date(`${iso}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

const splitAddress = (s: string | null | undefined) =>
  (s ?? '')
    .split(/\r?\n|,\s*/)
    .map((x) => x.trim())
    .filter(Boolean);

export function supplierOf(w: Workshop): DocumentSupplier {
  const settings = workshopSettingsSchema.parse(w.settings ?? {});
  return {
    name: w.name,
    addressLines: splitAddress(w.addressLines),
    postcode: w.postcode ?? '',
    vatNumber: w.vatNumber ?? '',
    phone: settings.contactPhone || null,
    email: settings.contactEmail || null,
  };
}

export async function partiesOf(job: JobRow, t?: Transaction): Promise<{ customer: DocumentParty & { email: string | null }; job: DocumentJob; customerId: string }> {
  const aircraft = await Aircraft.findByPk(job.aircraftId, { transaction: t, include: [{ model: Customer, as: 'customer' }] });
  if (!aircraft?.customer) throw notFound('The owner of this aircraft');
  const c = aircraft.customer;
  return {
    customerId: c.id,
    customer: { name: c.name, addressLines: splitAddress(c.addressLines), postcode: c.postcode ?? '', email: c.email || null },
    job: { number: job.number, title: job.title, registration: aircraft.registration, aircraft: aircraft.type },
  };
}

/** Which moves of a job toward an invoice are still in the way, in the manager's words; null when none. */
function issueBlocker(job: JobRow, hasInvoice: boolean, gross: string): string | null {
  if (hasInvoice) return 'This job already has an invoice. Corrections are made with a credit note.';
  if (job.state !== 'ready_for_release') {
    return `An invoice is issued when the job is ready for release; this job is ${JOB_STATE_LABELS[job.state as JobState].toLowerCase()}.`;
  }
  if (!new Dec(gross).greaterThan(0)) return 'Nothing agreed on this job has a price yet, so there is nothing to invoice.';
  return null;
}

/** The invoice document for the job as it stands, numbered `number` (the preview passes a placeholder). */
async function documentFor(scope: Scope, job: JobRow, number: string, at: Date, t: Transaction): Promise<InvoiceDocument> {
  const w = await Workshop.findByPk(scope.workshopId, { transaction: t });
  if (!w) throw notFound('The workshop');
  const settings = workshopSettingsSchema.parse(w.settings ?? {});
  const { lines, accessTasks } = await loadLines(scope, job.id, t);
  const priced = priceEstimate(estimateEngineInput(lines, accessTasks), pricingOf(w));
  const findings = await Finding.findAll({ where: { jobId: job.id, workshopId: scope.workshopId }, attributes: ['id', 'seq', 'title'], transaction: t });
  const deposits = await boundSequelize().query<{
    id: string;
    amount: string;
    refunded: string;
    received_at: Date;
    method: string;
    reference: string | null;
    vat_mix: { rate: string; gross: string }[] | null;
  }>(
    `SELECT p.id, p.amount::text AS amount, p.refunded::text AS refunded, p.received_at, p.method, p.reference, d.vat_mix
       FROM payments p LEFT JOIN deposit_requests d ON d.id = p.deposit_request_id
      WHERE p.job_id = $1 AND p.kind = 'deposit' AND p.state IN ('succeeded', 'partially_refunded') AND p.amount IS NOT NULL
      ORDER BY p.received_at, p.id`,
    { bind: [job.id], type: QueryTypes.SELECT, transaction: t },
  );
  const parties = await partiesOf(job, t);
  const issuedOn = ukDate(at);
  const dueOn = addDays(issuedOn, settings.paymentTermsDays);
  return buildInvoiceDocument({
    number,
    issuedOn,
    // The balance's time of supply: the invoice date (issued when the work is finished) [VAT Act 1994 s6(4)–(5), practice].
    taxPoint: issuedOn,
    dueOn,
    paymentTermsDays: settings.paymentTermsDays,
    supplier: supplierOf(w),
    customer: parties.customer,
    job: parties.job,
    lines,
    accessTasks,
    priced,
    findingNames: Object.fromEntries(findings.map((f) => [f.id, `F-${f.seq} ${f.title}`])),
    deposits: deposits.map((d) => ({
      paymentId: d.id,
      amount: d.amount,
      refunded: d.refunded,
      receivedOn: ukDate(new Date(d.received_at ?? at)),
      method: d.method,
      reference: d.reference,
      vatMix: d.vat_mix ?? [],
    })),
  });
}

/** The next number of a workshop's gap-free sequence, taken under the counter row's lock in the caller's transaction. */
export async function takeNumber(workshopId: string, kind: 'invoice' | 'credit_note', t: Transaction): Promise<{ seq: number; number: string }> {
  const sequelize = boundSequelize();
  await sequelize.query(`INSERT INTO document_counters (workshop_id, kind, prefix) VALUES ($1, $2, $3) ON CONFLICT (workshop_id, kind) DO NOTHING`, {
    bind: [workshopId, kind, kind === 'invoice' ? 'INV-' : 'CN-'],
    transaction: t,
  });
  // Locked until the issuing transaction ends: a rolled-back issue hands its number back.
  const rows = await sequelize.query<{ next_value: number; prefix: string }>(
    `UPDATE document_counters SET next_value = next_value + 1 WHERE workshop_id = $1 AND kind = $2 RETURNING next_value - 1 AS next_value, prefix`,
    { bind: [workshopId, kind], type: QueryTypes.SELECT, transaction: t },
  );
  const row = rows[0];
  if (!row) throw new AppError('internal', 500, 'The document counter could not be read.');
  return { seq: row.next_value, number: `${row.prefix}${String(row.next_value).padStart(5, '0')}` };
}

export async function previewInvoice(scope: Scope, jobId: string): Promise<InvoicePreviewDto> {
  requireStaff(scope);
  return inTransaction(async (t) => {
    const job = await findJob(scope, jobId, t);
    const has = (await Invoice.count({ where: { jobId: job.id }, transaction: t })) > 0;
    const document = await documentFor(scope, job, '(number given on issue)', new Date(), t);
    return { document, blocker: issueBlocker(job, has, document.totals.gross) };
  });
}

/** Issue inside the caller's transaction (job row locked first, then the counter row). */
export async function issueInvoiceIn(scope: Scope, jobId: string, input: IssueInput, t: Transaction): Promise<Invoice> {
  const job = await lockJob(scope, jobId, t);
  const has = (await Invoice.count({ where: { jobId: job.id }, transaction: t })) > 0;
  const draft = await documentFor(scope, job, 'draft', new Date(), t);
  const blocker = issueBlocker(job, has, draft.totals.gross);
  if (blocker) throw new AppError('invalid_transition', 409, blocker);
  if (input.expectedGross !== undefined && !new Dec(input.expectedGross).equals(draft.totals.gross)) {
    throw conflict(`The total changed since the preview (now ${formatMoney(draft.totals.gross, draft.currency)}). Look at the preview again before issuing.`);
  }
  const { seq, number } = await takeNumber(scope.workshopId, 'invoice', t);
  const document: InvoiceDocument = { ...draft, number };
  const invoice = await Invoice.create(
    {
      workshopId: scope.workshopId,
      jobId: job.id,
      seq,
      number,
      taxPoint: document.taxPoint,
      dueOn: document.dueOn,
      currency: document.currency,
      rounding: document.rounding,
      net: document.totals.net,
      vat: document.totals.vat,
      gross: document.totals.gross,
      depositsGross: document.deposits.reduce((a, d) => a.plus(d.amount), new Dec(0)).toFixed(minorUnits(document.currency)),
      balanceDue: document.balanceDue,
      document,
      issuedBy: scope.userId,
    },
    { transaction: t },
  );
  await moveJob(scope, job, 'invoiced', `invoice ${number} issued`, t);
  await recordAudit(scope, t, {
    jobId: job.id,
    action: 'invoice.issued',
    summary: `Invoice ${number} issued: ${formatMoney(document.totals.gross, document.currency)} incl. VAT, deposits ${formatMoney(invoice.depositsGross, document.currency)}, balance due ${formatMoney(document.balanceDue, document.currency)} by ${formatCalendarDate(document.dueOn)}`,
    detail: { invoiceId: invoice.id, number, gross: document.totals.gross, balanceDue: document.balanceDue },
  });
  // Deposits may already cover everything.
  await settleJobIfCovered(scope, job.id, t);
  return invoice;
}

export async function issueInvoice(scope: Scope, jobId: string, input: IssueInput): Promise<InvoiceDto> {
  requireStaff(scope);
  const id = await inTransaction(async (t) => (await issueInvoiceIn(scope, jobId, input, t)).id);
  return getInvoice(scope, id);
}

interface InvoiceRow {
  id: string;
  number: string;
  job_id: string;
  job_number: string;
  registration: string;
  customer_id: string;
  customer_name: string;
  state: InvoiceSummaryDto['state'];
  issued_at: Date;
  due_on: string;
  currency: string;
  gross: string;
  credited: string;
  received: string;
  paid: string;
  refunded: string;
  email: DocumentEmailState;
  total: string;
}

/**
 * Invoices the scope may see: staff their workshop's, an owner only those of their own aircraft.
 * The filter picks ids only; the page is cut from them and only its rows are given their job,
 * owner, credit notes and what the job has received, so a list of thousands reads one page's worth.
 */
async function invoiceRows(scope: Scope, where: string[], bind: unknown[], page?: { limit: number; offset: number }): Promise<InvoiceRow[]> {
  const { conds, params } = scopedMoneyFilter(scope, 'i.workshop_id', where, bind);
  const paging = page ? ` LIMIT ${page.limit} OFFSET ${page.offset}` : '';
  return boundSequelize().query<InvoiceRow>(
    `WITH f AS MATERIALIZED (
       SELECT i.id, i.seq FROM invoices i JOIN jobs j ON j.id = i.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
        WHERE ${conds.join(' AND ')}
     ),
     pg AS (SELECT id FROM f ORDER BY seq DESC${paging})
     SELECT i.id, i.number, i.job_id, j.number AS job_number, a.registration, a.customer_id, c.name AS customer_name, i.state, i.issued_at,
            i.due_on::text AS due_on, i.currency, i.gross::text AS gross,
            COALESCE((SELECT SUM(cn.gross) FROM credit_notes cn WHERE cn.invoice_id = i.id), 0)::text AS credited,
            (SELECT COALESCE(SUM(p.amount - p.refunded), 0) FROM payments p WHERE p.job_id = i.job_id AND p.state IN ('succeeded', 'partially_refunded'))::text AS received,
            (SELECT COALESCE(SUM(p.amount), 0) FROM payments p WHERE p.job_id = i.job_id AND p.state IN ('succeeded', 'partially_refunded', 'refunded'))::text AS paid,
            (SELECT COALESCE(SUM(p.refunded), 0) FROM payments p WHERE p.job_id = i.job_id AND p.state IN ('succeeded', 'partially_refunded', 'refunded'))::text AS refunded,
            CASE WHEN i.mailed_at IS NOT NULL THEN 'done' WHEN i.mail_given_up_at IS NOT NULL THEN 'not_sent' ELSE 'waiting' END AS email,
            (SELECT count(*) FROM f)::text AS total
       FROM pg JOIN invoices i ON i.id = pg.id JOIN jobs j ON j.id = i.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
      ORDER BY i.seq DESC`,
    { bind: params, type: QueryTypes.SELECT },
  );
}

/** The row's money as jobMoney works it (invoice after credit notes, less what the job received and kept), from the row itself. */
function summary(r: InvoiceRow): InvoiceSummaryDto {
  const dp = minorUnits(r.currency);
  const invoiced = new Dec(r.gross).minus(r.credited);
  return {
    id: r.id,
    number: r.number,
    jobId: r.job_id,
    jobNumber: r.job_number,
    registration: r.registration,
    customerId: r.customer_id,
    customerName: r.customer_name,
    state: r.state,
    issuedOn: ukDate(new Date(r.issued_at)),
    dueOn: r.due_on,
    currency: r.currency,
    gross: r.gross,
    invoiced: formatAmount(invoiced, dp),
    received: formatAmount(new Dec(r.received), dp),
    paid: formatAmount(new Dec(r.paid), dp),
    refunded: formatAmount(new Dec(r.refunded), dp),
    due: formatAmount(Dec.max(invoiced.minus(r.received), 0), dp),
  };
}

export async function listInvoices(scope: Scope, q: ListQuery): Promise<Page<InvoiceSummaryDto>> {
  requireStaff(scope);
  const where: string[] = [];
  const bind: unknown[] = [];
  const add = (sql: (n: number) => string, v: unknown) => {
    bind.push(v);
    where.push(sql(bind.length + 1));
  };
  if (q.jobId) add((n) => `i.job_id = ${arg(n)}`, q.jobId);
  if (q.customerId) add((n) => `a.customer_id = ${arg(n)}`, q.customerId);
  if (q.state) add((n) => `i.state = ${arg(n)}`, q.state);
  if (q.from) add((n) => `(i.issued_at AT TIME ZONE 'Europe/London')::date >= ${arg(n)}::date`, q.from);
  if (q.to) add((n) => `(i.issued_at AT TIME ZONE 'Europe/London')::date <= ${arg(n)}::date`, q.to);
  if (q.q) add((n) => `(i.number ILIKE ${arg(n)} OR j.number ILIKE ${arg(n)} OR a.registration ILIKE ${arg(n)} OR c.name ILIKE ${arg(n)})`, `%${q.q.replace(/[%_\\]/g, '\\$&')}%`);
  const rows = await invoiceRows(scope, where, bind, { limit: q.pageSize, offset: (q.page - 1) * q.pageSize });
  return { items: rows.map(summary), total: rows[0] ? Number(rows[0].total) : 0, page: q.page, pageSize: q.pageSize };
}

async function paymentsOf(jobId: string, currency: string): Promise<InvoicePaymentDto[]> {
  const dp = minorUnits(currency);
  const rows = await Payment.findAll({ where: { jobId }, order: [['createdAt', 'ASC'], ['id', 'ASC']] });
  return rows
    .filter((p) => p.amount !== null && p.state !== 'pending' && p.state !== 'failed' && p.state !== 'cancelled')
    .map((p) => ({
      id: p.id,
      kind: p.kind,
      method: p.method,
      state: p.state,
      amount: p.amount!,
      refunded: p.refunded,
      refundable: p.method === 'card' && p.stripeChargeId !== null ? formatAmount(new Dec(p.amount!).minus(p.refunded), dp) : formatAmount(new Dec(0), dp),
      receivedOn: p.receivedAt ? ukDate(p.receivedAt) : null,
      reference: p.reference,
    }));
}

export async function getInvoice(scope: Scope, id: string): Promise<InvoiceDto> {
  const [row] = await invoiceRows(scope, ['i.id = $2'], [id]);
  if (!row) throw notFound('That invoice');
  const inv = await Invoice.findByPk(row.id);
  if (!inv) throw notFound('That invoice');
  const s = summary(row);
  const creditNotes = await creditNoteSummaries(scope, { invoiceId: row.id });
  return {
    ...s,
    document: inv.document,
    creditNotes,
    payments: scope.role === 'owner' ? [] : await paymentsOf(row.job_id, row.currency),
    creditable: s.invoiced,
    email: scope.role === 'owner' ? null : row.email,
  };
}

/** The job's invoice, for the job page (owner of the job or staff); null before one is issued. */
export async function invoiceOfJob(scope: Scope, jobId: string): Promise<InvoiceDto | null> {
  const job = await findJob(scope, jobId);
  const inv = await Invoice.findOne({ where: { jobId: job.id, workshopId: scope.workshopId }, attributes: ['id'] });
  return inv ? getInvoice(scope, inv.id) : null;
}

/**
 * A payment taken another way (bank transfer, cash, cheque) towards the invoice: recorded by
 * accounts with its date and reference; when what is received covers the invoice the job becomes paid.
 * `alsoIn` runs in the same transaction once the payment is written: the route queues the owner's
 * receipt there, so the payment and its receipt task commit together (a process that stops after
 * the commit still sends the receipt; one that stops before it has recorded nothing).
 */
export async function recordOfflinePayment(
  scope: Scope,
  jobId: string,
  input: OfflineInput,
  alsoIn?: (paymentId: string, t: Transaction) => Promise<void>,
): Promise<{ paymentId: string; invoice: InvoiceDto }> {
  requireStaff(scope);
  const paymentId = await inTransaction(async (t) => {
    const id = await recordOfflinePaymentIn(scope, jobId, input, t);
    if (alsoIn) await alsoIn(id, t);
    return id;
  });
  const inv = await invoiceOfJob(scope, jobId);
  return { paymentId, invoice: inv! };
}

/** The same inside the caller's transaction (job row locked first); returns the payment's id. */
export async function recordOfflinePaymentIn(scope: Scope, jobId: string, input: OfflineInput, t: Transaction): Promise<string> {
  {
    const job = await lockJob(scope, jobId, t);
    const invoice = await Invoice.findOne({ where: { jobId: job.id, workshopId: scope.workshopId }, transaction: t });
    if (!invoice) throw conflict('Issue the invoice first: a payment is recorded against the invoice’s balance.');
    const money = await jobMoney(job.id, invoice.currency, t);
    const due = new Dec(money.due ?? '0');
    if (due.isZero()) throw conflict('Nothing is owed on this invoice, so there is no payment to record.');
    if (new Dec(input.amount).greaterThan(due)) {
      const msg = `That is more than the ${formatMoney(money.due!, invoice.currency)} still owed. Record at most what is owed.`;
      throw new AppError('invalid_amount', 422, msg, { amount: msg });
    }
    assertPaymentMove('pending', 'succeeded');
    // Received on the date given (noon UK time, so the date never slips across midnight).
    const receivedAt = new Date(`${input.receivedOn}T12:00:00Z`);
    const p = await Payment.create(
      {
        workshopId: scope.workshopId,
        jobId: job.id,
        kind: 'balance',
        method: input.method,
        invoiceId: invoice.id,
        // Offline money is in hand when recorded: it is created as received (pending → succeeded in one write).
        state: 'succeeded',
        currency: invoice.currency,
        expectedAmount: input.amount,
        amount: input.amount,
        receivedAt,
        reference: input.reference || null,
        recordedBy: scope.userId,
      },
      { transaction: t },
    );
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'payment.recorded',
      summary: `Payment recorded: ${formatMoney(input.amount, invoice.currency)} by ${input.method.replace('_', ' ')} received ${input.receivedOn}${input.reference ? ` (ref. ${input.reference})` : ''} against invoice ${invoice.number}`,
      detail: { paymentId: p.id, amount: input.amount, method: input.method, receivedOn: input.receivedOn, reference: input.reference },
    });
    await settleJobIfCovered(scope, job.id, t);
    return p.id;
  }
}

/** After a credit note: the invoice is credited once credit notes cover all of it. */
export async function creditInvoiceIfCleared(invoiceId: string, t: Transaction): Promise<void> {
  const invoice = await Invoice.findByPk(invoiceId, { transaction: t, lock: t.LOCK.UPDATE });
  if (!invoice || invoice.state === 'credited') return;
  const rows = await boundSequelize().query<{ credited: string }>(`SELECT COALESCE(SUM(gross), 0)::text AS credited FROM credit_notes WHERE invoice_id = $1`, {
    bind: [invoiceId],
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (new Dec(rows[0]?.credited ?? '0').greaterThanOrEqualTo(invoice.gross)) {
    assertInvoiceMove(invoice.state, 'credited');
    await invoice.update({ state: 'credited' }, { transaction: t });
  }
}

/**
 * The receipt of a received payment. A deposit states the VAT it carries at its own tax point, the
 * date received [VAT Act 1994 s6(4)], from the job's VAT mix when it was asked, through the engine.
 */
export async function receiptDocument(p: Payment, job: Pick<JobRow, 'id' | 'aircraftId' | 'number' | 'title'>, t?: Transaction): Promise<ReceiptDocument> {
  if (p.amount === null) throw new Error(`payment ${p.id} has no amount received`);
  const w = await Workshop.findByPk(p.workshopId, { transaction: t });
  if (!w) throw notFound('The workshop');
  const parties = await partiesOf(job as JobRow, t);
  const invoice = await Invoice.findOne({ where: { jobId: job.id }, attributes: ['number'], transaction: t });
  const receivedOn = ukDate(p.receivedAt ?? new Date());
  const deposit = p.kind === 'deposit' && p.depositRequestId ? await DepositRequest.findByPk(p.depositRequestId, { transaction: t }) : null;
  const hasMix = !!deposit?.vatMix.some((m) => new Dec(m.gross).greaterThan(0));
  return {
    version: 1,
    kind: 'receipt',
    paymentId: p.id,
    receivedOn,
    supplier: supplierOf(w),
    customer: parties.customer,
    job: parties.job,
    currency: p.currency,
    description: p.kind === 'balance' ? `Payment towards invoice ${invoice?.number ?? ''}`.trim() : deposit ? `Deposit: ${deposit.reason}` : 'Deposit',
    amount: p.amount,
    vat: deposit && hasMix ? depositVat(p.id, p.amount, receivedOn, deposit.vatMix, p.currency) : null,
    method: PAYMENT_METHOD_LABELS[p.method],
    invoiceNumber: p.kind === 'balance' ? (invoice?.number ?? null) : null,
    notes: [
      ...(p.reference ? [`Your reference: ${p.reference}`] : []),
      ...(p.kind === 'deposit' ? ['This deposit will be taken off the final invoice.'] : []),
    ],
  };
}
