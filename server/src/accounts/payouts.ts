import type Stripe from 'stripe';
import { QueryTypes, type Transaction } from 'sequelize';
import { Dec, formatAmount, fromMinorUnits, minorUnits } from '@wingstage/shared';
import type { PayoutDetailDto, PayoutDto } from '@wingstage/shared';
import { notFound } from '../errors/app-error.js';
import { boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';

/** One balance transaction of a payout, as fetched (integer minor units, as the processor sends them). */
export interface FetchedTransaction {
  id: string;
  type: string;
  source: string | null;
  amount: number;
  fee: number;
  net: number;
  created: number;
}

/**
 * Whether the nets of a payout's transactions add up to what reached the bank. Works in integer
 * minor units as sent; the payout's own (negative) transaction is left out. Nothing is adjusted:
 * the caller stores both figures as they are and flags a difference.
 */
export function reconcilePayout(payoutAmountMinor: number, txns: Pick<FetchedTransaction, 'type' | 'net'>[]): { netMinor: number; count: number; addsUp: boolean } {
  const own = txns.filter((t) => t.type !== 'payout');
  // Sum as decimals: integer minor units are exact in a double, but the sum of many need not be.
  const net = own.reduce((acc, t) => acc.plus(t.net), new Dec(0));
  return { netMinor: net.toNumber(), count: own.length, addsUp: net.equals(payoutAmountMinor) };
}

/** Every transaction of one payout, through the SDK's auto-pagination. */
export async function fetchPayoutTransactions(stripe: Stripe, payoutId: string): Promise<FetchedTransaction[]> {
  const out: FetchedTransaction[] = [];
  for await (const t of stripe.balanceTransactions.list({ payout: payoutId, limit: 100 })) {
    out.push({ id: t.id, type: t.type, source: typeof t.source === 'string' ? t.source : (t.source?.id ?? null), amount: t.amount, fee: t.fee, net: t.net, created: t.created });
  }
  return out;
}

/**
 * Stores one payout and its transactions, idempotently: a payout fetched again (schedule, webhook,
 * retry) updates its status and adds any transaction not yet stored, never a second row. Each
 * transaction is matched to the payment or refund it belongs to; the payout belongs to the workshop
 * of those payments. A payout that does not add up gets an exception (once).
 */
export async function storePayout(po: Pick<Stripe.Payout, 'id' | 'amount' | 'currency' | 'status' | 'arrival_date'>, txns: FetchedTransaction[], t: Transaction): Promise<{ id: string; workshopId: string | null; addsUp: boolean }> {
  const sequelize = boundSequelize();
  const currency = po.currency.toUpperCase();
  const dp = minorUnits(currency);
  const rec = reconcilePayout(po.amount, txns);
  const money = (minor: number) => fromMinorUnits(minor, currency);
  const arrival = new Date(po.arrival_date * 1000).toISOString().slice(0, 10);
  const [row] = await sequelize.query<{ id: string; workshop_id: string | null }>(
    `INSERT INTO payouts (stripe_payout_id, amount, currency, status, arrival_on, transactions_net, transactions_count, adds_up)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8)
     ON CONFLICT (stripe_payout_id) DO UPDATE SET status = EXCLUDED.status, amount = EXCLUDED.amount, arrival_on = EXCLUDED.arrival_on,
       transactions_net = EXCLUDED.transactions_net, transactions_count = EXCLUDED.transactions_count, adds_up = EXCLUDED.adds_up, fetched_at = now()
     RETURNING id, workshop_id`,
    { bind: [po.id, money(po.amount), currency, po.status, arrival, formatAmount(new Dec(rec.netMinor).dividedBy(new Dec(10).pow(dp)), dp), rec.count, rec.addsUp], type: QueryTypes.SELECT, transaction: t },
  );
  const payoutId = row!.id;
  for (const x of txns) {
    if (x.type === 'payout') continue;
    await sequelize.query(
      `INSERT INTO payout_transactions (payout_id, stripe_balance_transaction_id, type, source_id, gross, fee, net, currency, occurred_at, payment_id, refund_id)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, to_timestamp($9),
         (SELECT p.id FROM payments p WHERE p.stripe_balance_transaction_id = $2 OR ($4::text IS NOT NULL AND p.stripe_charge_id = $4) LIMIT 1),
         (SELECT r.id FROM refunds r WHERE r.stripe_balance_transaction_id = $2 OR ($4::text IS NOT NULL AND r.stripe_refund_id = $4) LIMIT 1))
       ON CONFLICT (stripe_balance_transaction_id) DO UPDATE SET
         payment_id = COALESCE(payout_transactions.payment_id, EXCLUDED.payment_id),
         refund_id = COALESCE(payout_transactions.refund_id, EXCLUDED.refund_id)`,
      { bind: [payoutId, x.id, x.type.slice(0, 60), x.source, money(x.amount), money(x.fee), money(x.net), currency, x.created], transaction: t },
    );
  }
  // The workshop is the one whose payments or refunds the payout carried.
  const [owner] = await sequelize.query<{ workshop_id: string | null }>(
    `UPDATE payouts SET workshop_id = COALESCE(workshop_id, (
        SELECT COALESCE(p.workshop_id, r.workshop_id) FROM payout_transactions pt
          LEFT JOIN payments p ON p.id = pt.payment_id LEFT JOIN refunds r ON r.id = pt.refund_id
         WHERE pt.payout_id = $1 AND (p.id IS NOT NULL OR r.id IS NOT NULL) LIMIT 1))
      WHERE id = $1 RETURNING workshop_id`,
    { bind: [payoutId], type: QueryTypes.SELECT, transaction: t },
  );
  const workshopId = owner?.workshop_id ?? null;
  if (!rec.addsUp && workshopId) {
    const diff = formatAmount(new Dec(rec.netMinor).minus(po.amount).dividedBy(new Dec(10).pow(dp)), dp);
    await sequelize.query(
      `INSERT INTO account_exceptions (workshop_id, kind, subject_key, payout_id, reason)
       VALUES ($1, 'payout_does_not_add_up', $2, $3, $4) ON CONFLICT (workshop_id, kind, subject_key) DO NOTHING`,
      {
        bind: [workshopId, `payout:${po.id}`, payoutId, `Payout ${po.id} of ${money(po.amount)} ${currency}: its ${rec.count} transactions net ${formatAmount(new Dec(rec.netMinor).dividedBy(new Dec(10).pow(dp)), dp)} (difference ${diff}).`],
        transaction: t,
      },
    );
  }
  return { id: payoutId, workshopId, addsUp: rec.addsUp };
}

/** Fetches one payout and its transactions and stores them (the `payout.paid` webhook and the schedule). */
export async function syncPayout(stripe: Stripe, payoutId: string, t: Transaction): Promise<{ id: string; workshopId: string | null; addsUp: boolean }> {
  const po = await stripe.payouts.retrieve(payoutId);
  const txns = await fetchPayoutTransactions(stripe, payoutId);
  return storePayout(po, txns, t);
}

/**
 * The schedule's work: every payout the processor lists (newest first), each stored in its own
 * transaction. Stops paging at the first payout already stored as paid, unless `all` is asked.
 */
export async function syncPayouts(stripe: Stripe, opts: { all?: boolean } = {}): Promise<{ fetched: number; stored: number }> {
  const sequelize = boundSequelize();
  let fetched = 0;
  let stored = 0;
  for await (const po of stripe.payouts.list({ limit: 100 })) {
    fetched += 1;
    const [known] = await sequelize.query<{ status: string }>(`SELECT status FROM payouts WHERE stripe_payout_id = $1`, { bind: [po.id], type: QueryTypes.SELECT });
    if (known?.status === 'paid' && !opts.all) break;
    const txns = await fetchPayoutTransactions(stripe, po.id);
    await sequelize.transaction(async (t) => {
      await storePayout(po, txns, t);
    });
    stored += 1;
  }
  return { fetched, stored };
}

type PayoutRow = { id: string; stripe_payout_id: string; amount: string; currency: string; status: string; arrival_on: string; transactions_net: string; transactions_count: number; adds_up: boolean };

function toPayoutDto(r: PayoutRow): PayoutDto {
  const dp = minorUnits(r.currency);
  return {
    id: r.id,
    stripePayoutId: r.stripe_payout_id,
    amount: r.amount,
    currency: r.currency,
    status: r.status,
    arrivalOn: r.arrival_on,
    transactionsNet: r.transactions_net,
    transactionsCount: r.transactions_count,
    addsUp: r.adds_up,
    difference: formatAmount(new Dec(r.transactions_net).minus(r.amount), dp),
  };
}

const PAYOUT_COLUMNS = `id, stripe_payout_id, amount::text, currency, status, arrival_on::text, transactions_net::text, transactions_count, adds_up`;

export async function listPayouts(scope: Scope, range?: { from?: string; to?: string }): Promise<PayoutDto[]> {
  const rows = await boundSequelize().query<PayoutRow>(
    `SELECT ${PAYOUT_COLUMNS} FROM payouts WHERE workshop_id = $1
       AND ($2::date IS NULL OR arrival_on >= $2::date) AND ($3::date IS NULL OR arrival_on <= $3::date)
     ORDER BY arrival_on DESC, stripe_payout_id DESC LIMIT 500`,
    { bind: [scope.workshopId, range?.from ?? null, range?.to ?? null], type: QueryTypes.SELECT },
  );
  return rows.map(toPayoutDto);
}

export async function getPayout(scope: Scope, id: string): Promise<PayoutDetailDto> {
  const sequelize = boundSequelize();
  const [row] = await sequelize.query<PayoutRow>(`SELECT ${PAYOUT_COLUMNS} FROM payouts WHERE id = $1 AND workshop_id = $2`, { bind: [id, scope.workshopId], type: QueryTypes.SELECT });
  if (!row) throw notFound('That payout');
  const txns = await sequelize.query<{ id: string; stripe_balance_transaction_id: string; type: string; occurred_at: Date; gross: string; fee: string; net: string; payment_id: string | null; refund_id: string | null; job_number: string | null }>(
    `SELECT pt.id, pt.stripe_balance_transaction_id, pt.type, pt.occurred_at, pt.gross::text, pt.fee::text, pt.net::text, pt.payment_id, pt.refund_id, j.number AS job_number
       FROM payout_transactions pt
       LEFT JOIN payments p ON p.id = pt.payment_id
       LEFT JOIN refunds r ON r.id = pt.refund_id
       LEFT JOIN jobs j ON j.id = COALESCE(p.job_id, r.job_id)
      WHERE pt.payout_id = $1 ORDER BY pt.occurred_at, pt.stripe_balance_transaction_id`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  return {
    ...toPayoutDto(row),
    transactions: txns.map((x) => ({ id: x.id, balanceTransactionId: x.stripe_balance_transaction_id, type: x.type, occurredAt: new Date(x.occurred_at).toISOString(), gross: x.gross, fee: x.fee, net: x.net, paymentId: x.payment_id, refundId: x.refund_id, jobNumber: x.job_number })),
  };
}
