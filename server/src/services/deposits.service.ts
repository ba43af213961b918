import { createHash } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import {
  Dec,
  assertDepositRequestMove,
  assertPaymentMove,
  depositOnQuoteAccepted,
  depositOnWorkApproved,
  formatAmount,
  formatMoney,
  minorUnits,
  workshopSettingsSchema,
  type DepositAccountsDto,
  type DepositAccountsQuery,
  type DepositListQuery,
  type DepositReceivedRow,
  type DepositRequestCancelInput,
  type DepositRequestCreateInput,
  type DepositRequestDto,
  type DepositWaitingRow,
  type Page,
  type PaymentDto,
  type PricedChoice,
} from '@wingstage/shared';
import { inTransaction } from '../db/transaction.js';
import { AppError, conflict, notFound } from '../errors/app-error.js';
import { depositRequestedMail } from '../mail/deposit-mails.js';
import { ApprovalRequest, DepositRequest, Payment, Workshop, boundSequelize } from '../models/index.js';
import { depositDto, expireSession, processorTrouble, recordAppAudit } from '../payments/card-payments.js';
import { depositMailFacts } from '../payments/deposit-facts.js';
import { recordAudit } from './audit.js';
import type { Deps } from './deps.js';
import { findJob, lockJob } from './job-access.js';
import type { Scope } from './scope.js';

/** Job states in which a deposit may still be asked: before the invoice, and not on a cancelled or closed job. */
const ASKABLE = new Set(['booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release']);

/** Owners never see the workshop's card fees or staff notes. */
function forAudience(scope: Scope, d: DepositRequestDto): DepositRequestDto {
  if (scope.role !== 'owner') return d;
  const hide = (p: PaymentDto): PaymentDto => ({ ...p, fee: null, net: null, outcomeNote: null, amountMismatch: false });
  return { ...d, payments: d.payments.map(hide) };
}

async function dtosFor(scope: Scope, deposits: DepositRequest[], t?: Transaction): Promise<DepositRequestDto[]> {
  if (!deposits.length) return [];
  const payments = await Payment.findAll({ where: { depositRequestId: deposits.map((d) => d.id) }, transaction: t });
  return deposits.map((d) => forAudience(scope, depositDto(d, payments)));
}

/** The job's deposits, newest first (owners: their own job only, else 404). */
export async function listJobDeposits(scope: Scope, jobId: string): Promise<DepositRequestDto[]> {
  const job = await findJob(scope, jobId);
  const deposits = await DepositRequest.findAll({ where: { jobId: job.id, workshopId: scope.workshopId }, order: [['createdAt', 'DESC'], ['id', 'ASC']] });
  return dtosFor(scope, deposits);
}

async function raise(
  deps: Deps,
  t: Transaction,
  d: { workshopId: string; jobId: string; origin: DepositRequest['origin']; approvalRequestId: string | null; reason: string; amount: string; currency: string; vatMix: { rate: string; gross: string }[]; createdBy: string | null },
): Promise<DepositRequest> {
  const deposit = await DepositRequest.create({ ...d, state: 'waiting' }, { transaction: t });
  const facts = await depositMailFacts(deps, deposit, t);
  if (facts) await deps.mail.enqueue(depositRequestedMail(facts), t);
  return deposit;
}

/** A deposit asked by hand (manager or admin), with the reason the owner reads. */
export async function createDeposit(deps: Deps, scope: Scope, jobId: string, input: DepositRequestCreateInput): Promise<DepositRequestDto> {
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    if (!ASKABLE.has(job.state)) throw conflict('A deposit can only be asked before the job is invoiced, and not on a cancelled or closed job.');
    const workshop = await Workshop.findByPk(scope.workshopId, { attributes: ['id', 'currency'], transaction: t });
    const currency = workshop!.currency;
    const dp = minorUnits(currency);
    const amount = new Dec(input.amount);
    if (amount.decimalPlaces() > dp) throw conflict(`Amount can have at most ${dp} decimal places in ${currency}.`);
    const deposit = await raise(deps, t, {
      workshopId: scope.workshopId,
      jobId: job.id,
      origin: 'manual',
      approvalRequestId: null,
      reason: input.reason,
      amount: formatAmount(amount, dp),
      currency,
      vatMix: await currentVatMix(job.id, t),
      createdBy: scope.userId,
    });
    await recordAudit(scope, t, {
      jobId: job.id,
      action: 'deposit.requested',
      summary: `Deposit of ${formatMoney(deposit.amount, currency)} requested: ${deposit.reason}`,
      detail: { depositRequestId: deposit.id, origin: 'manual' },
    });
    return (await dtosFor(scope, [deposit], t))[0]!;
  });
}

/** The job's committed VAT mix (gross per rate) from the last decided approval, for deposits asked by hand. */
async function currentVatMix(jobId: string, t: Transaction): Promise<{ rate: string; gross: string }[]> {
  const [row] = await boundSequelize().query<{ mix: { rate: string; gross: string }[] | null }>(
    `SELECT vat_mix AS mix FROM deposit_requests WHERE job_id = $1 AND jsonb_array_length(vat_mix) > 0 ORDER BY created_at DESC LIMIT 1`,
    { bind: [jobId], type: QueryTypes.SELECT, transaction: t },
  );
  return row?.mix ?? [];
}

export interface DecisionForDeposit {
  workshopId: string;
  jobId: string;
  approvalRequestId: string;
  /** The decision priced by the engine (priceChoice). */
  figures: PricedChoice;
}

/** The quote's gross when accepted in this decision, the newly approved work beside it, and the job's VAT mix after it. */
function decisionAmounts(f: PricedChoice): { quoteGross: string | null; workGross: string; vatMix: { rate: string; gross: string }[] } {
  const dp = minorUnits(f.currency);
  const quote = f.items.find((i) => i.kind === 'quote' && i.choice === 'approve');
  const quoteGross = quote ? quote.gross : null;
  const work = new Dec(f.approvingNow.gross).minus(quoteGross ?? '0');
  return {
    quoteGross,
    workGross: formatAmount(Dec.max(work, 0), dp),
    vatMix: f.newTotal.byRate.map((r) => ({ rate: r.rate, gross: formatAmount(new Dec(r.net).plus(r.vat), dp) })),
  };
}

/**
 * The owner's decision may raise a deposit by the workshop's policy: a share of the accepted quote,
 * or a share of newly approved work above the threshold. Called once from the decision's
 * transaction (job locked); the unique index on (approval request, origin) keeps it to one.
 */
export async function raiseDepositsForDecision(deps: Deps, decision: DecisionForDeposit, t: Transaction): Promise<void> {
  const d = { ...decision, currency: decision.figures.currency, ...decisionAmounts(decision.figures) };
  const workshop = await Workshop.findByPk(d.workshopId, { attributes: ['id', 'settings'], transaction: t });
  const policy = workshopSettingsSchema.parse(workshop?.settings ?? {}).depositPolicy;
  if (policy.kind === 'none') return;
  const asks: { origin: 'quote_accepted' | 'work_approved'; amount: string; reason: string }[] = [];
  if (d.quoteGross !== null) {
    const a = depositOnQuoteAccepted(d.quoteGross, d.currency, policy);
    if (a.applies) asks.push({ origin: 'quote_accepted', amount: a.amount, reason: `${policy.kind === 'quote_percent' ? policy.percent : ''}% of the quote you accepted (${formatMoney(a.basis, d.currency)})` });
  }
  const w = depositOnWorkApproved(d.workGross, d.currency, policy);
  if (w.applies) asks.push({ origin: 'work_approved', amount: w.amount, reason: `${policy.kind === 'approved_work_percent' ? policy.percent : ''}% of the work you approved (${formatMoney(w.basis, d.currency)})` });
  for (const ask of asks) {
    const exists = await DepositRequest.count({ where: { approvalRequestId: d.approvalRequestId, origin: ask.origin }, transaction: t });
    if (exists) continue;
    const deposit = await raise(deps, t, { workshopId: d.workshopId, jobId: d.jobId, origin: ask.origin, approvalRequestId: d.approvalRequestId, reason: ask.reason, amount: ask.amount, currency: d.currency, vatMix: d.vatMix, createdBy: null });
    await recordAppAudit(t, {
      workshopId: d.workshopId,
      jobId: d.jobId,
      action: 'deposit.requested',
      summary: `Deposit of ${formatMoney(deposit.amount, d.currency)} requested by the workshop's deposit policy: ${deposit.reason}`,
      detail: { depositRequestId: deposit.id, origin: ask.origin, approvalRequestId: d.approvalRequestId },
    });
  }
}

/**
 * Cancels a waiting deposit (manager or admin). Its open payment pages are expired through the
 * processor first; if one of them was paid meanwhile the cancel is refused (refund it instead).
 */
export async function cancelDeposit(deps: Deps, scope: Scope, jobId: string, depositId: string, input: DepositRequestCancelInput): Promise<DepositRequestDto> {
  return inTransaction(async (t) => {
    const job = await lockJob(scope, jobId, t);
    const deposit = await DepositRequest.findOne({ where: { id: depositId, jobId: job.id, workshopId: scope.workshopId }, transaction: t, lock: t.LOCK.UPDATE });
    if (!deposit) throw notFound('That deposit');
    await cancelDepositIn(deps, scope, deposit, input.reason || null, 'Payment page closed unpaid: the workshop cancelled the deposit.', t);
    return (await dtosFor(scope, [deposit], t))[0]!;
  });
}

/**
 * Cancels one deposit request, locked by the caller after its job: its open payment pages are
 * expired through the processor, then the request moves to cancelled with a history line.
 */
async function cancelDepositIn(deps: Deps, scope: Scope, deposit: DepositRequest, reason: string | null, pageNote: string, t: Transaction): Promise<void> {
  assertDepositRequestMove(deposit.state, 'cancelled');
  const open = await Payment.findAll({ where: { depositRequestId: deposit.id, state: ['pending', 'failed'] }, order: [['createdAt', 'ASC']], transaction: t, lock: t.LOCK.UPDATE });
  for (const p of open) {
    let closed: boolean;
    try {
      closed = await expireSession(deps, p.stripeCheckoutSessionId);
    } catch (err) {
      throw processorTrouble(err);
    }
    if (!closed) throw conflict('The owner has just paid this deposit, so it cannot be cancelled. Reload to see the payment; refund it if it is not wanted.');
    assertPaymentMove(p.state, 'cancelled');
    await p.update({ state: 'cancelled', outcomeNote: pageNote }, { transaction: t });
  }
  await deposit.update({ state: 'cancelled', cancelledAt: new Date(), cancelledBy: scope.userId, cancelReason: reason }, { transaction: t });
  await recordAudit(scope, t, {
    jobId: deposit.jobId,
    action: 'deposit.cancelled',
    summary: `Deposit of ${formatMoney(deposit.amount, deposit.currency)} cancelled${reason ? `: ${reason}` : ''}`,
    detail: { depositRequestId: deposit.id, pagesClosed: open.length },
  });
}

/**
 * A cancelled job asks for no more money: each of its deposits still waiting is cancelled, and its
 * open payment pages closed, in the job's cancelling transaction (the job row is already locked).
 */
export async function cancelWaitingDepositsOfJob(deps: Deps, scope: Scope, jobId: string, t: Transaction): Promise<number> {
  const waiting = await DepositRequest.findAll({ where: { jobId, workshopId: scope.workshopId, state: 'waiting' }, order: [['createdAt', 'ASC'], ['id', 'ASC']], transaction: t, lock: t.LOCK.UPDATE });
  for (const d of waiting) await cancelDepositIn(deps, scope, d, 'the job was cancelled', 'Payment page closed unpaid: the job was cancelled.', t);
  return waiting.length;
}

const WAITING_SQL = `
  SELECT d.id, d.job_id AS "jobId", j.number AS "jobNumber", a.registration, c.name AS "ownerName", d.reason,
         d.amount::text AS amount, d.currency, d.created_at AS "createdAt",
         (SELECT p.failure_message FROM payments p WHERE p.deposit_request_id = d.id ORDER BY p.created_at DESC LIMIT 1) AS "lastMessage",
         (SELECT p.state FROM payments p WHERE p.deposit_request_id = d.id ORDER BY p.created_at DESC LIMIT 1) AS "lastState",
         (SELECT count(*)::int FROM payments p WHERE p.deposit_request_id = d.id AND p.state IN ('pending', 'failed')) AS "openPages",
         count(*) OVER ()::int AS total
    FROM deposit_requests d
    JOIN jobs j ON j.id = d.job_id
    JOIN aircraft a ON a.id = j.aircraft_id
    JOIN customers c ON c.id = a.customer_id
   WHERE d.workshop_id = $1 AND d.state = 'waiting'
   ORDER BY d.created_at ASC, d.id
   LIMIT $2 OFFSET $3`;

type WaitingSqlRow = Omit<DepositWaitingRow, 'createdAt' | 'lastDecline'> & { createdAt: Date; lastMessage: string | null; lastState: string | null; total: number };

const waitingRow = (r: WaitingSqlRow): DepositWaitingRow => ({
  id: r.id,
  jobId: r.jobId,
  jobNumber: r.jobNumber,
  registration: r.registration,
  ownerName: r.ownerName,
  reason: r.reason,
  amount: r.amount,
  currency: r.currency,
  createdAt: new Date(r.createdAt).toISOString(),
  lastDecline: r.lastState === 'failed' ? (r.lastMessage ?? 'The card was declined.') : null,
  openPages: r.openPages,
});

/** Deposits still waiting across the workshop, oldest first (staff). */
export async function listWaitingDeposits(scope: Scope, q: DepositListQuery): Promise<Page<DepositWaitingRow>> {
  const rows = await boundSequelize().query<WaitingSqlRow>(WAITING_SQL, { bind: [scope.workshopId, q.pageSize, (q.page - 1) * q.pageSize], type: QueryTypes.SELECT });
  return { items: rows.map(waitingRow), total: rows[0]?.total ?? 0, page: q.page, pageSize: q.pageSize };
}

/**
 * Accounts' deposits page: a page of the deposits received by card or offline (with fee and net),
 * newest first, and a page of those still waiting, oldest first. The totals are summed in
 * PostgreSQL (NUMERIC) over every deposit in the workshop's currency, not over the page.
 */
export async function depositAccounts(scope: Scope, q: DepositAccountsQuery): Promise<DepositAccountsDto> {
  const workshop = await Workshop.findByPk(scope.workshopId, { attributes: ['id', 'currency'] });
  const currency = workshop!.currency;
  const received = await boundSequelize().query<Omit<DepositReceivedRow, 'receivedAt'> & { receivedAt: Date | null }>(
    `SELECT p.id AS "paymentId", p.deposit_request_id AS "depositRequestId", p.job_id AS "jobId", j.number AS "jobNumber", a.registration,
            c.name AS "ownerName", d.reason, p.currency, p.amount::text AS amount, p.fee::text AS fee, p.net::text AS net,
            p.refunded::text AS refunded, p.state, p.amount_mismatch AS "amountMismatch", p.outcome_note AS "outcomeNote", p.received_at AS "receivedAt"
       FROM (SELECT p.* FROM payments p
              WHERE p.workshop_id = $1 AND p.kind = 'deposit' AND p.state IN ('succeeded', 'partially_refunded', 'refunded')
              ORDER BY p.received_at DESC NULLS LAST, p.id LIMIT $2 OFFSET $3) p
       JOIN deposit_requests d ON d.id = p.deposit_request_id
       JOIN jobs j ON j.id = p.job_id
       JOIN aircraft a ON a.id = j.aircraft_id
       JOIN customers c ON c.id = a.customer_id
      ORDER BY p.received_at DESC NULLS LAST, p.id`,
    { bind: [scope.workshopId, q.pageSize, (q.receivedPage - 1) * q.pageSize], type: QueryTypes.SELECT },
  );
  const [sums] = await boundSequelize().query<{ count: number; received: string; fees: string; net: string; waitingCount: number; waiting: string }>(
    `SELECT r.count, r.received, r.fees, r.net, w.count AS "waitingCount", w.waiting
       FROM (SELECT count(*)::int AS count, COALESCE(SUM(amount) FILTER (WHERE currency = $2), 0)::text AS received,
                    COALESCE(SUM(fee) FILTER (WHERE currency = $2), 0)::text AS fees, COALESCE(SUM(net) FILTER (WHERE currency = $2), 0)::text AS net
               FROM payments WHERE workshop_id = $1 AND kind = 'deposit' AND state IN ('succeeded', 'partially_refunded', 'refunded')) r,
            (SELECT count(*)::int AS count, COALESCE(SUM(amount) FILTER (WHERE currency = $2), 0)::text AS waiting
               FROM deposit_requests WHERE workshop_id = $1 AND state = 'waiting') w`,
    { bind: [scope.workshopId, currency], type: QueryTypes.SELECT },
  );
  const waiting = await listWaitingDeposits(scope, { page: q.waitingPage, pageSize: q.pageSize });
  const dp = minorUnits(currency);
  const fmt = (x: string) => formatAmount(new Dec(x), dp);
  return {
    currency,
    received: received.map((r) => ({ ...r, receivedAt: r.receivedAt ? new Date(r.receivedAt).toISOString() : null })),
    receivedTotal: sums!.count,
    receivedPage: q.receivedPage,
    waiting: waiting.items,
    waitingTotal: sums!.waitingCount,
    waitingPage: q.waitingPage,
    pageSize: q.pageSize,
    totals: { received: fmt(sums!.received), fees: fmt(sums!.fees), net: fmt(sums!.net), waiting: fmt(sums!.waiting) },
  };
}

/** What the owner's decision page may show after deciding: the deposits that decision raised (no fees, no staff words). */
export interface DecisionDepositsDto {
  jobId: string;
  deposits: { id: string; amount: string; currency: string; reason: string; state: DepositRequest['state'] }[];
}

/** The deposits one decision raised, found by the decision link (same 404 as the page for an unknown or revoked link). */
export async function depositsForDecisionLink(token: string): Promise<DecisionDepositsDto> {
  const r = await ApprovalRequest.findOne({ where: { tokenHash: createHash('sha256').update(token, 'utf8').digest('hex') }, attributes: ['id', 'jobId', 'state'] });
  if (!r || r.state === 'revoked') throw new AppError('not_found', 404, 'This approval link is not valid. Use the link in the newest e-mail from the workshop.');
  const deposits = await DepositRequest.findAll({ where: { approvalRequestId: r.id }, order: [['createdAt', 'ASC'], ['id', 'ASC']] });
  return { jobId: r.jobId, deposits: deposits.map((d) => ({ id: d.id, amount: d.amount, currency: d.currency, reason: d.reason, state: d.state })) };
}
