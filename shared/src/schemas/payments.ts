import { z } from 'zod';
import type { DepositOrigin, DepositRequestState, PaymentKind, PaymentMethod, PaymentState } from '../states.js';
import { TEXT_MAX, decimalString, idSchema, optionalText, requiredText } from './common.js';

/**
 * Opening a card payment page for the owner of the job: a deposit asked of them, or what the
 * invoice still asks for (the balance). The server works out the amount; the body never carries one.
 */
export const checkoutCreateSchema = z.discriminatedUnion(
  'for',
  [
    z.object({ for: z.literal('deposit'), depositRequestId: idSchema }).strict(),
    z.object({ for: z.literal('balance') }).strict(),
  ],
  { message: 'Say what the payment is for: a deposit or the balance.' },
);
export type CheckoutCreateInput = z.output<typeof checkoutCreateSchema>;

/** The processor's id of a payment page, as it comes back on the return address. */
export const checkoutSessionIdSchema = z
  .string({ message: 'The payment page reference is missing.' })
  .trim()
  .regex(/^cs_[A-Za-z0-9_]{1,250}$/, { message: 'That is not a payment page reference.' });

/** Back from the payment page: the server reads the session through the processor before saying anything. */
export const checkoutSyncSchema = z.object({ sessionId: checkoutSessionIdSchema }).strict();
export type CheckoutSyncInput = z.output<typeof checkoutSyncSchema>;

/** A deposit asked by hand (manager or admin): the amount including VAT and the reason shown to the owner. */
export const depositRequestCreateSchema = z
  .object({
    amount: decimalString(2, 'Amount').refine((v) => /[1-9]/.test(v), { message: 'Amount must be more than zero.' }),
    reason: requiredText(1, TEXT_MAX.reason, 'Reason'),
  })
  .strict();
export type DepositRequestCreateInput = z.output<typeof depositRequestCreateSchema>;

export const depositRequestCancelSchema = z.object({ reason: optionalText(TEXT_MAX.reason, 'Reason') }).strict();
export type DepositRequestCancelInput = z.output<typeof depositRequestCancelSchema>;

export const depositParamsSchema = z.object({ id: idSchema, depositId: idSchema });

export const depositListQuerySchema = z.object({
  page: z.coerce.number({ message: 'Page must be a whole number.' }).int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number({ message: 'Page size must be a whole number.' }).int().min(1).max(100).default(25),
});
export type DepositListQuery = z.output<typeof depositListQuerySchema>;

/** Accounts' deposits page: the received and the waiting lists are paged on their own. */
export const depositAccountsQuerySchema = z.object({
  receivedPage: z.coerce.number({ message: 'Page must be a whole number.' }).int().min(1).max(100_000).default(1),
  waitingPage: z.coerce.number({ message: 'Page must be a whole number.' }).int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number({ message: 'Page size must be a whole number.' }).int().min(1).max(100).default(50),
});
export type DepositAccountsQuery = z.output<typeof depositAccountsQuerySchema>;

/** One attempt to take money, as pages show it. Amounts are decimal strings; fee and net only for staff. */
export interface PaymentDto {
  id: string;
  jobId: string;
  kind: PaymentKind;
  method: PaymentMethod;
  state: PaymentState;
  depositRequestId: string | null;
  invoiceId: string | null;
  currency: string;
  expectedAmount: string;
  amount: string | null;
  fee: string | null;
  net: string | null;
  refunded: string;
  amountMismatch: boolean;
  failureMessage: string | null;
  outcomeNote: string | null;
  receivedAt: string | null;
  createdAt: string;
}

export interface DepositRequestDto {
  id: string;
  jobId: string;
  origin: DepositOrigin;
  reason: string;
  amount: string;
  currency: string;
  state: DepositRequestState;
  createdAt: string;
  paidAt: string | null;
  cancelledAt: string | null;
  cancelReason: string | null;
  version: number;
  /** Newest first. */
  payments: PaymentDto[];
  /** The last decline the owner met while this deposit is still waiting, in the processor's words. */
  lastDecline: string | null;
}

/** What the owner's return page shows: only what the server knows after reading the session back. */
export interface CheckoutSyncDto {
  payment: PaymentDto;
  deposit: DepositRequestDto | null;
  /** The page is still open and the last card tried was declined. */
  declined: string | null;
}

export interface DepositWaitingRow {
  id: string;
  jobId: string;
  jobNumber: string;
  registration: string;
  ownerName: string;
  reason: string;
  amount: string;
  currency: string;
  createdAt: string;
  lastDecline: string | null;
  openPages: number;
}

export interface DepositReceivedRow {
  paymentId: string;
  depositRequestId: string | null;
  jobId: string;
  jobNumber: string;
  registration: string;
  ownerName: string;
  reason: string;
  currency: string;
  amount: string;
  fee: string | null;
  net: string | null;
  refunded: string;
  state: PaymentState;
  amountMismatch: boolean;
  outcomeNote: string | null;
  receivedAt: string | null;
}

/**
 * Accounts' deposits page: one page of deposits received (with fee and net) and one of deposits
 * still waiting, each with how many there are in all; the totals cover every deposit, not the page.
 */
export interface DepositAccountsDto {
  currency: string;
  received: DepositReceivedRow[];
  receivedTotal: number;
  receivedPage: number;
  waiting: DepositWaitingRow[];
  waitingTotal: number;
  waitingPage: number;
  pageSize: number;
  totals: { received: string; fees: string; net: string; waiting: string };
}
