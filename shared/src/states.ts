/**
 * Allowed state transitions, declared once and enforced by the server's services.
 * The client uses the same tables to decide which actions to offer.
 */

export const JOB_STATES = [
  'booked_in',
  'inspecting',
  'awaiting_owner',
  'in_work',
  'ready_for_release',
  'invoiced',
  'paid',
  'closed',
  'cancelled',
] as const;
export type JobState = (typeof JOB_STATES)[number];

export const JOB_STATE_LABELS: Record<JobState, string> = {
  booked_in: 'Booked in',
  inspecting: 'Inspecting',
  awaiting_owner: 'Awaiting owner',
  in_work: 'In work',
  ready_for_release: 'Ready for release',
  invoiced: 'Invoiced',
  paid: 'Paid',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

/**
 * The same states said from the owner's side (vocabulary.md, "Job states"): the owner's pages use
 * these, never the staff words above.
 */
export const OWNER_JOB_STATE_LABELS: Record<JobState, string> = {
  booked_in: 'Booked in',
  inspecting: 'Being inspected',
  awaiting_owner: 'Waiting for your decision',
  in_work: 'Work under way',
  ready_for_release: 'Work finished',
  invoiced: 'Invoice ready',
  paid: 'Paid',
  closed: 'Closed',
  cancelled: 'Cancelled',
};

/** from → the states it may move to. Cancelled is possible only before invoicing. */
export const JOB_TRANSITIONS: Record<JobState, readonly JobState[]> = {
  booked_in: ['inspecting', 'cancelled'],
  inspecting: ['awaiting_owner', 'in_work', 'cancelled'],
  awaiting_owner: ['in_work', 'inspecting', 'cancelled'],
  in_work: ['awaiting_owner', 'ready_for_release', 'cancelled'],
  ready_for_release: ['in_work', 'invoiced', 'cancelled'],
  invoiced: ['paid'],
  paid: ['closed'],
  closed: [],
  cancelled: [],
};

/**
 * States a job reaches only through money, never by a button: invoiced when its invoice is issued,
 * paid when what is received covers the invoice (vocabulary.md, "Job states").
 */
export const JOB_STATES_BY_MONEY: readonly JobState[] = ['invoiced', 'paid'];

/** Why a person cannot move a job into a state set by money, in the office's words. */
export const JOB_STATE_BY_MONEY_REASON: Partial<Record<JobState, string>> = {
  invoiced: 'A job becomes invoiced when its invoice is issued: use "Issue invoice".',
  paid: 'A job becomes paid when the money received covers its invoice: use "Record a payment" for money taken another way.',
};

/** The moves a person may make by hand from a state: the table above without the moves money makes. */
export function manualJobMoves(from: JobState): readonly JobState[] {
  return JOB_TRANSITIONS[from].filter((s) => !JOB_STATES_BY_MONEY.includes(s));
}

/** The button label for moving a job into each state (vocabulary.md, "Actions"). */
export const JOB_TRANSITION_ACTIONS: Record<JobState, string> = {
  booked_in: 'Book in',
  inspecting: 'Start inspection',
  awaiting_owner: 'Hold for owner',
  in_work: 'Start work',
  ready_for_release: 'Mark ready for release',
  invoiced: 'Issue invoice',
  paid: 'Record a payment',
  closed: 'Close job',
  cancelled: 'Cancel job',
};

export type TransitionCheck = { ok: true } | { ok: false; reason: string };

export function canTransition(from: JobState, to: JobState): TransitionCheck {
  if (from === to) return { ok: false, reason: `The job is already ${JOB_STATE_LABELS[to].toLowerCase()}.` };
  if (JOB_TRANSITIONS[from].includes(to)) return { ok: true };
  if (to === 'cancelled') {
    return { ok: false, reason: 'A job can be cancelled only before it is invoiced.' };
  }
  return {
    ok: false,
    reason: `A job that is ${JOB_STATE_LABELS[from].toLowerCase()} cannot move to ${JOB_STATE_LABELS[to].toLowerCase()}.`,
  };
}

export function nextJobStates(from: JobState): readonly JobState[] {
  return JOB_TRANSITIONS[from];
}

export function isTerminalJobState(state: JobState): boolean {
  return JOB_TRANSITIONS[state].length === 0;
}

/**
 * Findings (vocabulary.md): draft → priced → sent → approved / declined, or approved within the
 * pre-authorised limit, or withdrawn. A priced finding goes back to draft if its lines are removed;
 * a sent one goes back to priced when its request is replaced.
 */
export const FINDING_STATES = ['draft', 'priced', 'sent', 'approved', 'approved_within_limit', 'declined', 'withdrawn'] as const;
export type FindingState = (typeof FINDING_STATES)[number];

export const FINDING_STATE_LABELS: Record<FindingState, string> = {
  draft: 'Draft',
  priced: 'Priced',
  sent: 'Sent to owner',
  approved: 'Approved',
  approved_within_limit: 'Approved under standing go-ahead',
  declined: 'Declined',
  withdrawn: 'Withdrawn',
};

/**
 * Finding states from the owner's side. "Within limit" is the owner's standing go-ahead (their
 * pre-authorised limit), never to be confused with a measured limit.
 */
export const OWNER_FINDING_STATE_LABELS: Record<FindingState, string> = {
  draft: 'Being priced',
  priced: 'Being priced',
  sent: 'Waiting for your decision',
  approved: 'You approved',
  approved_within_limit: 'Approved under your standing go-ahead',
  declined: 'You declined',
  withdrawn: 'Withdrawn by the workshop',
};

export const FINDING_TRANSITIONS: Record<FindingState, readonly FindingState[]> = {
  draft: ['priced', 'approved_within_limit', 'withdrawn'],
  priced: ['draft', 'sent', 'approved_within_limit', 'withdrawn'],
  sent: ['priced', 'approved', 'declined', 'withdrawn'],
  approved: [],
  approved_within_limit: [],
  declined: ['priced'],
  withdrawn: [],
};

export function canMoveFinding(from: FindingState, to: FindingState): TransitionCheck {
  if (FINDING_TRANSITIONS[from].includes(to)) return { ok: true };
  return {
    ok: false,
    reason: `A finding that is ${FINDING_STATE_LABELS[from].toLowerCase()} cannot become ${FINDING_STATE_LABELS[to].toLowerCase()}.`,
  };
}

/**
 * An airworthiness finding is open until it is rectified (approved and the work recorded as done)
 * or withdrawn; declining it does not close it. An open one blocks ready for release.
 */
export function isOpenAirworthiness(f: { category: string; state: FindingState; rectifiedAt: string | null }): boolean {
  return f.category === 'airworthiness' && f.state !== 'withdrawn' && f.rectifiedAt === null;
}

/**
 * Approval requests (vocabulary.md): sent → decided, or expired, revoked, or replaced when a price
 * changed after sending (the newer request supersedes it).
 */
export const APPROVAL_REQUEST_STATES = ['sent', 'decided', 'expired', 'revoked', 'replaced'] as const;
export type ApprovalRequestState = (typeof APPROVAL_REQUEST_STATES)[number];
export const APPROVAL_REQUEST_STATE_LABELS: Record<ApprovalRequestState, string> = {
  sent: 'Sent',
  decided: 'Decided',
  expired: 'Expired',
  revoked: 'Link revoked',
  replaced: 'Replaced',
};
/** Approval request states from the owner's side. */
export const OWNER_APPROVAL_REQUEST_STATE_LABELS: Record<ApprovalRequestState, string> = {
  sent: 'Waiting for your decision',
  decided: 'You decided',
  expired: 'Link expired',
  revoked: 'Revoked by the workshop',
  replaced: 'A newer link was sent',
};
export const APPROVAL_REQUEST_TRANSITIONS: Record<ApprovalRequestState, readonly ApprovalRequestState[]> = {
  sent: ['decided', 'expired', 'revoked', 'replaced'],
  decided: [],
  expired: [],
  revoked: [],
  replaced: [],
};

/** Resend is not a move: it gives a request still waiting for the owner a new link for the same snapshot. */
export function canResendRequest(state: ApprovalRequestState): TransitionCheck {
  if (state === 'sent') return { ok: true };
  return {
    ok: false,
    reason: `This request is ${APPROVAL_REQUEST_STATE_LABELS[state].toLowerCase()}; only a request waiting for the owner can be re-sent. Send a new request instead.`,
  };
}

export function canMoveRequest(from: ApprovalRequestState, to: ApprovalRequestState): TransitionCheck {
  if (APPROVAL_REQUEST_TRANSITIONS[from].includes(to)) return { ok: true };
  return {
    ok: false,
    reason: `An approval request that is ${APPROVAL_REQUEST_STATE_LABELS[from].toLowerCase()} cannot become ${APPROVAL_REQUEST_STATE_LABELS[to].toLowerCase()}.`,
  };
}

// ─── Enforcement ─────────────────────────────────────────────────────────────

export type StateMachine = 'job' | 'finding' | 'approval_request' | 'payment' | 'deposit_request' | 'invoice' | 'exception';

/**
 * A forbidden state move. Thrown by the assert functions below; the server's one error handler
 * answers it with 409 `invalid_transition` and the reason, and the transaction writes nothing.
 */
export class StateMoveError extends Error {
  override readonly name = 'StateMoveError';
  constructor(
    readonly machine: StateMachine,
    readonly from: string,
    readonly to: string,
    readonly reason: string,
  ) {
    super(reason);
  }
}

function assertCheck(machine: StateMachine, from: string, to: string, check: TransitionCheck): void {
  if (!check.ok) throw new StateMoveError(machine, from, to, check.reason);
}

/** Every write of a job's state goes through this. */
export function assertJobMove(from: JobState, to: JobState): void {
  assertCheck('job', from, to, canTransition(from, to));
}

/** Every write of a finding's state goes through this. */
export function assertFindingMove(from: FindingState, to: FindingState): void {
  assertCheck('finding', from, to, canMoveFinding(from, to));
}

/** Every write of an approval request's state goes through this. */
export function assertRequestMove(from: ApprovalRequestState, to: ApprovalRequestState): void {
  assertCheck('approval_request', from, to, canMoveRequest(from, to));
}

export function assertRequestResendable(state: ApprovalRequestState): void {
  assertCheck('approval_request', state, state, canResendRequest(state));
}

// ─── The quote ───────────────────────────────────────────────────────────────

/**
 * The quote's state, derived (never stored) from the inspection lines' agreement and the open
 * requests: not sent; sent (a request holding it waits for the owner); agreed (every inspection
 * line agreed); changed (agreed before, but a line changed or was added since); declined (the owner
 * declined the last request holding it).
 */
export const QUOTE_STATES = ['not_sent', 'sent', 'agreed', 'changed', 'declined'] as const;
export type QuoteState = (typeof QUOTE_STATES)[number];

/** Staff words. */
export const QUOTE_STATE_LABELS: Record<QuoteState, string> = {
  not_sent: 'Quote not sent',
  sent: 'Quote sent, waiting for the owner',
  agreed: 'Quote agreed',
  changed: 'Quote changed since it was agreed',
  declined: 'Quote declined by the owner',
};

/** The owner's words for the same states (vocabulary.md: states said from the owner's side). */
export const QUOTE_STATE_OWNER_WORDS: Record<QuoteState, string> = {
  not_sent: 'Being priced',
  sent: 'Waiting for your decision',
  agreed: 'You agreed the quote',
  changed: 'Being re-priced: the workshop will send you the changes',
  declined: 'You declined the quote: the workshop will be in touch',
};

/** How an inspection line came to be agreed. */
export const AGREED_HOW = ['owner_link', 'phone', 'recorded_before'] as const;
export type AgreedHow = (typeof AGREED_HOW)[number];

export function quoteStateOf(q: {
  /** Inspection lines on the estimate, agreed and unagreed. */
  agreedLines: number;
  unagreedLines: number;
  /** A request holding the quote is waiting for the owner. */
  quoteRequestOpen: boolean;
  /** The owner's decision on the quote in the latest decided request holding it, if any. */
  lastQuoteDecision: 'approve' | 'decline' | null;
}): QuoteState {
  if (q.unagreedLines === 0) return q.agreedLines > 0 ? 'agreed' : 'not_sent';
  if (q.quoteRequestOpen) return 'sent';
  if (q.lastQuoteDecision === 'decline') return 'declined';
  if (q.agreedLines > 0 || q.lastQuoteDecision === 'approve') return 'changed';
  return 'not_sent';
}

/** Work may start only once nothing in the quote waits for the owner. */
export function canStartWork(q: { unagreedLines: number }): TransitionCheck {
  if (q.unagreedLines === 0) return { ok: true };
  return {
    ok: false,
    reason: `The owner has not agreed the quote: ${q.unagreedLines} inspection line${q.unagreedLines === 1 ? '' : 's'} await${q.unagreedLines === 1 ? 's' : ''} their decision. Send the quote, or record that they agreed it by phone.`,
  };
}

/**
 * Card payments (vocabulary.md, "payment"): one record per attempt to take money for a deposit or a
 * balance. pending while the payer is on the payment page; failed when the card was declined (the
 * payer may try again, so failed can go back to pending, or straight to succeeded when the webhooks
 * arrive out of order); cancelled when the page expired or was closed unpaid; succeeded once the
 * money is taken; refunds move it on. The processor's own states stay in its ids and events.
 */
export const PAYMENT_STATES = ['pending', 'succeeded', 'failed', 'cancelled', 'partially_refunded', 'refunded'] as const;
export type PaymentState = (typeof PAYMENT_STATES)[number];

export const PAYMENT_STATE_LABELS: Record<PaymentState, string> = {
  pending: 'Waiting for payment',
  succeeded: 'Paid',
  failed: 'Card declined',
  cancelled: 'Cancelled',
  partially_refunded: 'Partly refunded',
  refunded: 'Refunded',
};

export const PAYMENT_TRANSITIONS: Record<PaymentState, readonly PaymentState[]> = {
  pending: ['succeeded', 'failed', 'cancelled'],
  failed: ['pending', 'succeeded', 'cancelled'],
  succeeded: ['partially_refunded', 'refunded'],
  partially_refunded: ['refunded'],
  cancelled: [],
  refunded: [],
};

export function canMovePayment(from: PaymentState, to: PaymentState): TransitionCheck {
  if (PAYMENT_TRANSITIONS[from].includes(to)) return { ok: true };
  if (from === to) return { ok: false, reason: `The payment is already ${PAYMENT_STATE_LABELS[to].toLowerCase()}.` };
  return {
    ok: false,
    reason: `A payment that is ${PAYMENT_STATE_LABELS[from].toLowerCase()} cannot become ${PAYMENT_STATE_LABELS[to].toLowerCase()}.`,
  };
}

/** For services: move or throw, so no write can skip the table above. */
export function assertPaymentMove(from: PaymentState, to: PaymentState): void {
  const check = canMovePayment(from, to);
  if (!check.ok) throw new StateMoveError('payment', from, to, check.reason);
}

export function isTerminalPaymentState(state: PaymentState): boolean {
  return PAYMENT_TRANSITIONS[state].length === 0;
}

/** How a payment was taken (vocabulary.md, "payment"): by card through the processor, or offline. */
export const PAYMENT_METHODS = ['card', 'bank_transfer', 'cash', 'cheque'] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];
export const PAYMENT_METHOD_LABELS: Record<PaymentMethod, string> = {
  card: 'Card',
  bank_transfer: 'Bank transfer',
  cash: 'Cash',
  cheque: 'Cheque',
};

/** What a payment is for: a deposit asked before the invoice, or (part of) the invoice's balance. */
export const PAYMENT_KINDS = ['deposit', 'balance'] as const;
export type PaymentKind = (typeof PAYMENT_KINDS)[number];

/**
 * Deposit requests (vocabulary.md): waiting until a payment against it succeeds (paid), or until
 * staff cancel it (only while nothing has been paid).
 */
export const DEPOSIT_REQUEST_STATES = ['waiting', 'paid', 'cancelled'] as const;
export type DepositRequestState = (typeof DEPOSIT_REQUEST_STATES)[number];

export const DEPOSIT_REQUEST_STATE_LABELS: Record<DepositRequestState, string> = {
  waiting: 'Waiting for payment',
  paid: 'Paid',
  cancelled: 'Cancelled',
};

export const DEPOSIT_REQUEST_TRANSITIONS: Record<DepositRequestState, readonly DepositRequestState[]> = {
  waiting: ['paid', 'cancelled'],
  paid: [],
  cancelled: [],
};

export const DEPOSIT_ORIGINS = ['quote_accepted', 'work_approved', 'manual'] as const;
export type DepositOrigin = (typeof DEPOSIT_ORIGINS)[number];

export function canMoveDepositRequest(from: DepositRequestState, to: DepositRequestState): TransitionCheck {
  if (DEPOSIT_REQUEST_TRANSITIONS[from].includes(to)) return { ok: true };
  if (from === to) return { ok: false, reason: `The deposit request is already ${DEPOSIT_REQUEST_STATE_LABELS[to].toLowerCase()}.` };
  if (from === 'paid' && to === 'cancelled') return { ok: false, reason: 'A paid deposit cannot be cancelled: refund it instead, with a credit note.' };
  return {
    ok: false,
    reason: `A deposit request that is ${DEPOSIT_REQUEST_STATE_LABELS[from].toLowerCase()} cannot become ${DEPOSIT_REQUEST_STATE_LABELS[to].toLowerCase()}.`,
  };
}

export function assertDepositRequestMove(from: DepositRequestState, to: DepositRequestState): void {
  assertCheck('deposit_request', from, to, canMoveDepositRequest(from, to));
}

/**
 * VAT invoices: issued (immutable; the balance is owed) → paid once what is received covers it;
 * credited when credit notes reduce it to nothing. A paid invoice may still be credited (a refund).
 */
export const INVOICE_STATES = ['issued', 'paid', 'credited'] as const;
export type InvoiceState = (typeof INVOICE_STATES)[number];

export const INVOICE_STATE_LABELS: Record<InvoiceState, string> = {
  issued: 'Issued, balance owed',
  paid: 'Paid',
  credited: 'Credited in full',
};

export const INVOICE_TRANSITIONS: Record<InvoiceState, readonly InvoiceState[]> = {
  issued: ['paid', 'credited'],
  paid: ['credited', 'issued'],
  credited: [],
};

export function canMoveInvoice(from: InvoiceState, to: InvoiceState): TransitionCheck {
  if (INVOICE_TRANSITIONS[from].includes(to)) return { ok: true };
  if (from === to) return { ok: false, reason: `The invoice is already ${INVOICE_STATE_LABELS[to].toLowerCase()}.` };
  return {
    ok: false,
    reason: `An invoice that is ${INVOICE_STATE_LABELS[from].toLowerCase()} cannot become ${INVOICE_STATE_LABELS[to].toLowerCase()}.`,
  };
}

export function assertInvoiceMove(from: InvoiceState, to: InvoiceState): void {
  assertCheck('invoice', from, to, canMoveInvoice(from, to));
}

/** Accounts' exceptions (vocabulary.md): open until resolved with a note. */
export const EXCEPTION_STATES = ['open', 'resolved'] as const;
export type ExceptionState = (typeof EXCEPTION_STATES)[number];
export const EXCEPTION_STATE_LABELS: Record<ExceptionState, string> = { open: 'Open', resolved: 'Resolved' };
export const EXCEPTION_TRANSITIONS: Record<ExceptionState, readonly ExceptionState[]> = { open: ['resolved'], resolved: [] };

export function assertExceptionMove(from: ExceptionState, to: ExceptionState): void {
  const ok = EXCEPTION_TRANSITIONS[from].includes(to);
  assertCheck('exception', from, to, ok ? { ok: true } : { ok: false, reason: from === to ? `The exception is already ${EXCEPTION_STATE_LABELS[to].toLowerCase()}.` : 'A resolved exception stays resolved.' });
}
