import { z } from 'zod';
import { isoDate, requiredText, shortText } from './common.js';

/** What a ledger row is: money in by card or offline, or money handed back. */
export const LEDGER_KINDS = ['deposit', 'balance', 'offline', 'refund'] as const;
export type LedgerKind = (typeof LEDGER_KINDS)[number];
export const LEDGER_KIND_LABELS: Record<LedgerKind, string> = { deposit: 'Deposit', balance: 'Balance', offline: 'Offline payment', refund: 'Refund' };

/** Things that do not match, found by the accounts checks; each is resolved by a person with a note. */
export const EXCEPTION_KINDS = ['paid_not_invoiced', 'unpaid_past_terms', 'amount_differs', 'refund_without_credit_note', 'payout_does_not_add_up'] as const;
export type ExceptionKind = (typeof EXCEPTION_KINDS)[number];
export const EXCEPTION_KIND_LABELS: Record<ExceptionKind, string> = {
  paid_not_invoiced: 'Paid, no invoice',
  unpaid_past_terms: 'Unpaid after terms',
  amount_differs: 'Amount not as asked',
  refund_without_credit_note: 'Refund, no credit note',
  payout_does_not_add_up: 'Payout does not add up',
};

const DATE_ORDER = { message: 'The start date must be on or before the end date.', path: ['to'] };

/** A period of days, both ends included. */
export const periodSchema = z
  .object({ from: isoDate, to: isoDate })
  .refine((p) => p.from <= p.to, DATE_ORDER);
export type Period = z.output<typeof periodSchema>;

export const LEDGER_SORTS = ['date', 'gross', 'fee', 'net', 'job', 'owner', 'kind'] as const;

export const ledgerQuerySchema = z
  .object({
    from: isoDate.optional(),
    to: isoDate.optional(),
    kind: z.enum(LEDGER_KINDS).optional(),
    status: shortText(40, 'Status').optional(),
    q: shortText(100, 'Search').optional().default(''),
    sort: z.enum(LEDGER_SORTS).optional().default('date'),
    dir: z.enum(['asc', 'desc']).optional().default('desc'),
    page: z.coerce.number().int().min(1).max(100000).optional().default(1),
    pageSize: z.coerce.number().int().min(1).max(200).optional().default(50),
  })
  .refine((p) => !p.from || !p.to || p.from <= p.to, DATE_ORDER);
export type LedgerQuery = z.output<typeof ledgerQuerySchema>;

export const exceptionListQuerySchema = z.object({
  state: z.enum(['open', 'resolved', 'all']).optional().default('open'),
});

export const exceptionResolveSchema = z.object({
  note: requiredText(1, 1000, 'A note saying how it was settled'),
});
export type ExceptionResolveInput = z.input<typeof exceptionResolveSchema>;

/** A page of the aged-debt list (owners by name); the totals always cover every owner. */
export const agedDebtQuerySchema = z.object({
  page: z.coerce.number({ message: 'Page must be a whole number.' }).int().min(1).max(100_000).optional().default(1),
  pageSize: z.coerce.number({ message: 'Page size must be a whole number.' }).int().min(1).max(200).optional().default(50),
});
export type AgedDebtQuery = z.output<typeof agedDebtQuerySchema>;

export const agedDebtReminderSchema = z.object({
  customerId: z.uuid({ message: 'Choose one from the list.' }),
});

export interface LedgerRowDto {
  id: string;
  kind: LedgerKind;
  date: string;
  jobId: string;
  jobNumber: string;
  ownerName: string;
  method: string;
  currency: string;
  gross: string;
  fee: string | null;
  net: string | null;
  status: string;
  payout: string | null;
  /** What it settles: the invoice number, or the deposit request's reason. */
  settles: string | null;
  /** The latest exception about this row and, once resolved, its note. */
  exception: { kind: ExceptionKind; state: 'open' | 'resolved'; note: string | null } | null;
}

export interface LedgerPageDto {
  items: LedgerRowDto[];
  total: number;
  page: number;
  pageSize: number;
  /** The whole filtered set, not just this page. */
  totals: { gross: string; fee: string; net: string };
  currency: string;
}

export interface PayoutTransactionDto {
  id: string;
  balanceTransactionId: string;
  type: string;
  occurredAt: string;
  gross: string;
  fee: string;
  net: string;
  paymentId: string | null;
  refundId: string | null;
  jobNumber: string | null;
}

export interface PayoutDto {
  id: string;
  stripePayoutId: string;
  amount: string;
  currency: string;
  status: string;
  arrivalOn: string;
  transactionsNet: string;
  transactionsCount: number;
  addsUp: boolean;
  /** transactionsNet − amount: "0.00" when it adds up. */
  difference: string;
}

export interface PayoutDetailDto extends PayoutDto {
  transactions: PayoutTransactionDto[];
}

export interface AccountExceptionDto {
  id: string;
  kind: ExceptionKind;
  reason: string;
  state: 'open' | 'resolved';
  jobId: string | null;
  jobNumber: string | null;
  paymentId: string | null;
  invoiceId: string | null;
  refundId: string | null;
  payoutId: string | null;
  createdAt: string;
  resolvedAt: string | null;
  resolvedByName: string | null;
  note: string | null;
}

export interface AgedDebtRowDto {
  customerId: string;
  ownerName: string;
  email: string | null;
  invoices: { id: string; number: string; dueOn: string; owed: string; daysOverdue: number }[];
  /** 0–30, 31–60, 61–90 and over 90 days past each invoice's due date (not yet due counts as 0–30). */
  buckets: { d0_30: string; d31_60: string; d61_90: string; over90: string };
  total: string;
}

export interface AgedDebtDto {
  asOf: string;
  currency: string;
  /** One page of owners, by name. */
  rows: AgedDebtRowDto[];
  page: number;
  pageSize: number;
  /** Owners who owe anything, on every page. */
  ownerCount: number;
  /** Over every owner, not only this page's. */
  totals: { d0_30: string; d31_60: string; d61_90: string; over90: string; total: string };
}

export interface VatDocumentDto {
  kind: 'deposit' | 'invoice' | 'credit_note';
  id: string;
  reference: string;
  jobNumber: string;
  taxPoint: string;
  /** Rate label ("20%"), or "mixed" for a deposit spread over several rates. */
  rate: string;
  net: string;
  vat: string;
  gross: string;
  note: string | null;
}

export interface VatSummaryDto {
  from: string;
  to: string;
  currency: string;
  byRate: { rate: string; net: string; vat: string; gross: string }[];
  totals: { net: string; vat: string; gross: string };
  documents: VatDocumentDto[];
}

export interface WeeklyMoneyDto {
  weeks: { weekStart: string; invoiced: string; received: string; paidOut: string }[];
  currency: string;
}
