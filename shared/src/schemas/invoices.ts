import { z } from 'zod';
import type { CreditNoteDocument, InvoiceDocument } from '../documents.js';
import { workshopToday } from '../dates.js';
import { Dec } from '../money.js';
import { INVOICE_STATES, PAYMENT_METHODS, type InvoiceState, type PaymentMethod, type PaymentState } from '../states.js';
import { decimalString, idSchema, isoDate, listQuerySchema, requiredText, shortText } from './common.js';

/** An amount of money to two decimal places that is more than nothing (refuses "0", "0.00"). */
const positiveAmount = (label: string) =>
  decimalString(2, label).refine((v) => !/^\d{1,12}(\.\d{1,2})?$/.test(v) || new Dec(v).greaterThan(0), { message: `${label} must be more than 0.` });

/** Issue the job's invoice. `expectedGross` (from the preview) guards against a price that changed meanwhile. */
export const invoiceIssueSchema = z
  .object({
    expectedGross: decimalString(2, 'Total').optional(),
  })
  .strict();
export type InvoiceIssueInput = z.input<typeof invoiceIssueSchema>;

/** Payments accounts record by hand: every method but card (card payments come from the processor). */
export const OFFLINE_PAYMENT_METHODS = PAYMENT_METHODS.filter((m): m is Exclude<PaymentMethod, 'card'> => m !== 'card');


/** A payment taken another way (bank transfer, cash, cheque) towards the invoice's balance. */
export const offlinePaymentSchema = z
  .object({
    amount: positiveAmount('Amount'),
    method: z.enum(OFFLINE_PAYMENT_METHODS as [Exclude<PaymentMethod, 'card'>, ...Exclude<PaymentMethod, 'card'>[]], { message: 'Choose bank transfer, cash or cheque.' }),
    receivedOn: isoDate.refine((d) => d <= workshopToday(), { message: 'The date received cannot be in the future.' }),
    reference: shortText(200, 'Reference').optional().default(''),
  })
  .strict();
export type OfflinePaymentInput = z.input<typeof offlinePaymentSchema>;

/** Hand back (part of) a card payment, always with a credit note against the invoice. */
export const refundSchema = z
  .object({
    paymentId: idSchema,
    amount: positiveAmount('Amount'),
    reason: requiredText(1, 500, 'Reason'),
  })
  .strict();
export type RefundInput = z.input<typeof refundSchema>;

/** A credit note without a refund: a goodwill reduction of what the owner owes. */
export const creditNoteSchema = z
  .object({
    amount: positiveAmount('Amount'),
    reason: requiredText(1, 500, 'Reason'),
  })
  .strict();
export type CreditNoteInput = z.input<typeof creditNoteSchema>;

export const invoiceListQuerySchema = listQuerySchema.extend({
  jobId: idSchema.optional(),
  customerId: idSchema.optional(),
  state: z.enum(INVOICE_STATES).optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
});

export const creditNoteListQuerySchema = listQuerySchema.extend({
  jobId: idSchema.optional(),
  customerId: idSchema.optional(),
  invoiceId: idSchema.optional(),
  from: isoDate.optional(),
  to: isoDate.optional(),
});

/**
 * Where the owner's e-mail of an invoice or credit note stands, for staff (an owner gets null):
 * `done` (queued to the owner, or the owner has no e-mail address), `waiting` (being tried),
 * `not_sent` (its tries were given up: staff send it again).
 */
export type DocumentEmailState = 'done' | 'waiting' | 'not_sent';

export interface CreditNoteSummaryDto {
  id: string;
  number: string;
  invoiceId: string;
  invoiceNumber: string;
  jobId: string;
  jobNumber: string;
  customerName: string;
  issuedOn: string;
  reason: string;
  currency: string;
  net: string;
  vat: string;
  gross: string;
  /** The refund paid with it, if any. */
  refunded: string | null;
  email: DocumentEmailState | null;
}

export interface CreditNoteDto extends CreditNoteSummaryDto {
  document: CreditNoteDocument;
}

export interface InvoicePaymentDto {
  id: string;
  kind: 'deposit' | 'balance';
  method: PaymentMethod;
  state: PaymentState;
  amount: string;
  refunded: string;
  /** What may still be refunded through the processor (card payments only), else "0.00". */
  refundable: string;
  receivedOn: string | null;
  reference: string | null;
}

export interface InvoiceSummaryDto {
  id: string;
  number: string;
  jobId: string;
  jobNumber: string;
  registration: string;
  customerId: string;
  customerName: string;
  state: InvoiceState;
  issuedOn: string;
  dueOn: string;
  currency: string;
  gross: string;
  /** The invoice after credit notes, what is received (paid less refunded), and what is still owed. */
  invoiced: string;
  received: string;
  due: string;
  /** Everything paid towards the job (deposits and balance) before refunds, and what was refunded of it. */
  paid: string;
  refunded: string;
}

export interface InvoiceDto extends InvoiceSummaryDto {
  document: InvoiceDocument;
  creditNotes: CreditNoteSummaryDto[];
  /** Payments on the job (staff only; an owner gets an empty list). */
  payments: InvoicePaymentDto[];
  /** Still creditable: the invoice after earlier credit notes. */
  creditable: string;
  email: DocumentEmailState | null;
}

/** The invoice a job would get if issued now (no number yet). */
export interface InvoicePreviewDto {
  document: InvoiceDocument;
  /** Why it cannot be issued now, in the manager's words; null when it can. */
  blocker: string | null;
}
