import type Stripe from 'stripe';
import type { InvoiceDocument, CreditNoteDocument } from '@wingstage/shared';
import { CreditNote, DepositRequest, Invoice, Payment, Refund, type Job } from '../src/models/index.js';

let invoiceSeq = 1000;

/** A card payment made and confirmed in the fake through the SDK, and the matching payments row. */
export async function cardPayment(sdk: Stripe, job: Job, amount: string, opts: { kind?: 'deposit' | 'balance'; invoiceId?: string | null; depositRequestId?: string | null; receivedAt?: Date; expected?: string } = {}): Promise<{ payment: Payment; charge: Stripe.Charge }> {
  const minor = Math.round(Number(amount.replace('.', '')));
  const pi = await sdk.paymentIntents.create({ amount: minor, currency: 'gbp', payment_method: 'pm_card_visa', confirm: true });
  const charge = await sdk.charges.retrieve(pi.latest_charge as string);
  const bt = await sdk.balanceTransactions.retrieve(charge.balance_transaction as string);
  const money = (m: number) => (m / 100).toFixed(2);
  const payment = await Payment.create({
    workshopId: job.workshopId,
    jobId: job.id,
    kind: opts.kind ?? 'balance',
    method: 'card',
    state: 'succeeded',
    currency: 'GBP',
    expectedAmount: opts.expected ?? amount,
    amount,
    fee: money(bt.fee),
    net: money(bt.net),
    invoiceId: opts.invoiceId ?? null,
    depositRequestId: opts.depositRequestId ?? null,
    stripePaymentIntentId: pi.id,
    stripeChargeId: charge.id,
    stripeBalanceTransactionId: bt.id,
    receivedAt: opts.receivedAt ?? new Date(),
    amountMismatch: opts.expected !== undefined && opts.expected !== amount,
  } as never);
  return { payment, charge };
}

/** An offline payment row (bank transfer), as accounts would record it. */
export async function offlinePayment(job: Job, amount: string, receivedAt: Date, invoiceId: string | null = null): Promise<Payment> {
  return Payment.create({ workshopId: job.workshopId, jobId: job.id, kind: 'balance', method: 'bank_transfer', state: 'succeeded', currency: 'GBP', expectedAmount: amount, amount, fee: '0.00', net: amount, invoiceId, receivedAt, reference: 'BACS' } as never);
}

export async function depositRequest(job: Job, amount: string, mix = [{ rate: '20', gross: '1200.00' }]): Promise<DepositRequest> {
  return DepositRequest.create({ workshopId: job.workshopId, jobId: job.id, origin: 'manual', reason: 'Parts ordered', amount, currency: 'GBP', vatMix: mix, state: 'paid', paidAt: new Date() } as never);
}

/** An issued invoice row with a frozen document of the given totals (single rate). */
export async function invoice(
  job: Job,
  p: { net: string; vat: string; gross: string; percent?: string; taxPoint: string; dueOn: string; deposits?: InvoiceDocument['deposits']; balanceDue?: string; issuedAt?: Date },
): Promise<Invoice> {
  invoiceSeq += 1;
  const number = `INV-${invoiceSeq}-${job.id.slice(0, 4)}`;
  const deposits = p.deposits ?? [];
  const depositsGross = deposits.reduce((a, d) => a + Number(d.amount) * 100, 0) / 100;
  const document = {
    version: 1,
    kind: 'invoice',
    number,
    issuedOn: p.taxPoint,
    taxPoint: p.taxPoint,
    dueOn: p.dueOn,
    currency: 'GBP',
    byRate: [{ vatRate: 'standard', vatPercent: p.percent ?? '20', net: p.net, vat: p.vat }],
    totals: { net: p.net, vat: p.vat, gross: p.gross },
    deposits,
    lines: [],
    notes: [],
  } as unknown as InvoiceDocument;
  return Invoice.create({
    workshopId: job.workshopId,
    jobId: job.id,
    seq: invoiceSeq,
    number,
    taxPoint: p.taxPoint,
    dueOn: p.dueOn,
    currency: 'GBP',
    rounding: 'invoice_half_up',
    net: p.net,
    vat: p.vat,
    gross: p.gross,
    depositsGross: depositsGross.toFixed(2),
    balanceDue: p.balanceDue ?? p.gross,
    document,
    ...(p.issuedAt ? { issuedAt: p.issuedAt } : {}),
  } as never);
}

export async function creditNote(inv: Invoice, p: { net: string; vat: string; gross: string; taxPoint: string }): Promise<CreditNote> {
  invoiceSeq += 1;
  const document = { version: 1, kind: 'credit_note', number: `CN-${invoiceSeq}`, byRate: [{ vatRate: 'standard', vatPercent: '20', net: p.net, vat: p.vat }], totals: p, lines: [], notes: [] } as unknown as CreditNoteDocument;
  return CreditNote.create({ workshopId: inv.workshopId, jobId: inv.jobId, invoiceId: inv.id, seq: invoiceSeq, number: `CN-${invoiceSeq}`, taxPoint: p.taxPoint, reason: 'Labour overcharged', net: p.net, vat: p.vat, gross: p.gross, document } as never);
}

/** A refund made through the SDK on a card payment, with or without a credit note row. */
export async function cardRefund(sdk: Stripe, payment: Payment, amount: string, creditNoteId: string | null = null): Promise<Refund> {
  const re = await sdk.refunds.create({ payment_intent: payment.stripePaymentIntentId!, amount: Math.round(Number(amount) * 100) });
  await Payment.update({ refunded: amount, state: amount === payment.amount ? 'refunded' : 'partially_refunded' } as never, { where: { id: payment.id } });
  return Refund.create({ workshopId: payment.workshopId, jobId: payment.jobId, paymentId: payment.id, creditNoteId, amount, currency: 'GBP', state: 'succeeded', reason: 'Returned', stripeRefundId: re.id, stripeBalanceTransactionId: (re.balance_transaction as string) ?? null } as never);
}
