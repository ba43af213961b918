import { QueryTypes } from 'sequelize';
import type { ExceptionKind, LedgerPageDto, LedgerQuery, LedgerRowDto } from '@wingstage/shared';
import { boundSequelize } from '../models/index.js';
import { likePattern } from '../services/list-helpers.js';
import type { Scope } from '../services/scope.js';
import { checkPeriod } from './period.js';

/*
 * The ledger: every amount that moved — payments received (deposit, balance, offline) and refunds
 * handed back (negative) — with what each settles and the payout that carried it. A card session
 * that was never paid (pending, failed, cancelled) moved no money and is not a ledger row.
 * Filtering, sorting, paging and the totals all happen in PostgreSQL on NUMERIC, so the totals
 * are exact and cover the whole filtered set.
 */
const BASE = `
  SELECT p.id, CASE WHEN p.method <> 'card' THEN 'offline' ELSE p.kind END AS kind, p.received_at AS at, p.job_id, p.currency,
         -- Money taken offline reaches the bank whole: no processor fee, net = gross.
         p.amount AS gross,
         CASE WHEN p.method <> 'card' THEN COALESCE(p.fee, 0) ELSE p.fee END AS fee,
         CASE WHEN p.method <> 'card' THEN COALESCE(p.net, p.amount) ELSE p.net END AS net,
         p.state AS status, NULL::uuid AS payment_id
    FROM payments p
   WHERE p.workshop_id = $1 AND p.amount IS NOT NULL AND p.received_at IS NOT NULL
  UNION ALL
  SELECT r.id, 'refund', r.created_at, r.job_id, r.currency, -r.amount, 0, -r.amount, r.state, r.payment_id
    FROM refunds r
   WHERE r.workshop_id = $1 AND r.state <> 'failed'`;

const SORTS: Record<LedgerQuery['sort'], string> = {
  date: 'l.at',
  gross: 'l.gross',
  fee: 'l.fee',
  net: 'l.net',
  job: 'j.number',
  owner: 'c.name',
  kind: 'l.kind',
};

/**
 * The filtered rows, lean: the job, aircraft and owner are joined only when a search or a sort
 * needs them, so counting and totalling 100,000 rows reads the two money tables alone.
 */
function filtered(q: Pick<LedgerQuery, 'from' | 'to' | 'kind' | 'status' | 'q' | 'sort'>): { sql: string; bind: unknown[] } {
  const bind: unknown[] = [];
  const where: string[] = [];
  const add = (v: unknown) => {
    bind.push(v);
    // A numbered bind placeholder; $1 is the workshop.
    return '$'.concat(String(bind.length + 1));
  };
  if (q.from) where.push(`l.at >= ${add(q.from)}::date`);
  if (q.to) where.push(`l.at < (${add(q.to)}::date + 1)`);
  if (q.kind) where.push(`l.kind = ${add(q.kind)}`);
  if (q.status) where.push(`l.status = ${add(q.status)}`);
  const needsOwner = Boolean(q.q) || q.sort === 'job' || q.sort === 'owner';
  if (q.q) {
    const p = add(likePattern(q.q));
    where.push(`(j.number ILIKE ${p} OR c.name ILIKE ${p} OR a.registration ILIKE ${p})`);
  }
  const joins = needsOwner ? 'JOIN jobs j ON j.id = l.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id' : '';
  return { sql: `FROM (${BASE}) l ${joins} ${where.length ? `WHERE ${where.join(' AND ')}` : ''}`, bind };
}

type Row = {
  id: string; kind: LedgerRowDto['kind']; at: Date; job_id: string; job_number: string; owner_name: string; method: string; currency: string; gross: string; fee: string | null; net: string | null;
  status: string; payout: string | null; invoice_number: string | null; deposit_reason: string | null; exc_kind: ExceptionKind | null; exc_state: 'open' | 'resolved' | null; exc_note: string | null;
};

/**
 * One page in the asked order (or every row, for the CSV export): the page's ids are chosen from
 * the lean rows first, and only those rows are then given their owner, what they settle, their
 * payout and their latest exception.
 */
async function rows(scope: Scope, q: LedgerQuery, all = false): Promise<LedgerRowDto[]> {
  const f = filtered(q);
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const limit = all ? '' : `LIMIT ${q.pageSize} OFFSET ${(q.page - 1) * q.pageSize}`;
  const list = await boundSequelize().query<Row>(
    `WITH pg AS (
       SELECT l.id, l.kind, l.at, l.job_id, l.currency, l.gross, l.fee, l.net, l.status, l.payment_id
         FROM (SELECT l.* ${f.sql} ORDER BY ${SORTS[q.sort]} ${dir} NULLS LAST, l.id ${dir} ${limit}) l
     )
     SELECT l.id, l.kind, l.at, l.job_id, j.number AS job_number, c.name AS owner_name, pm.method, l.currency, l.gross::text, l.fee::text, l.net::text, l.status,
            COALESCE(CASE WHEN l.kind = 'refund' THEN rf.stripe_payout_id ELSE pm.stripe_payout_id END,
                     (SELECT po.stripe_payout_id FROM payout_transactions pt JOIN payouts po ON po.id = pt.payout_id
                       WHERE (l.kind <> 'refund' AND pt.payment_id = l.id) OR (l.kind = 'refund' AND pt.refund_id = l.id) LIMIT 1)) AS payout,
            (SELECT i.number FROM invoices i WHERE i.id = pm.invoice_id OR (pm.invoice_id IS NULL AND pm.kind = 'balance' AND i.job_id = pm.job_id) LIMIT 1) AS invoice_number,
            (SELECT d.reason FROM deposit_requests d WHERE d.id = pm.deposit_request_id) AS deposit_reason,
            e.kind AS exc_kind, e.state AS exc_state, e.note AS exc_note
       FROM pg l
       JOIN payments pm ON pm.id = COALESCE(l.payment_id, l.id)
       LEFT JOIN refunds rf ON l.kind = 'refund' AND rf.id = l.id
       JOIN jobs j ON j.id = l.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
       LEFT JOIN LATERAL (SELECT x.kind, x.state, x.note FROM account_exceptions x
                           WHERE x.workshop_id = $1 AND ((l.kind = 'refund' AND x.refund_id = l.id) OR (l.kind <> 'refund' AND x.payment_id = l.id AND x.refund_id IS NULL))
                           ORDER BY x.created_at DESC LIMIT 1) e ON true
      ORDER BY ${SORTS[q.sort]} ${dir} NULLS LAST, l.id ${dir}`,
    { bind: [scope.workshopId, ...f.bind], type: QueryTypes.SELECT },
  );
  return list.map((r) => ({
    id: r.id,
    kind: r.kind,
    date: new Date(r.at).toISOString(),
    jobId: r.job_id,
    jobNumber: r.job_number,
    ownerName: r.owner_name,
    method: r.method,
    currency: r.currency,
    gross: r.gross,
    fee: r.fee,
    net: r.net,
    status: r.status,
    payout: r.payout,
    settles: r.invoice_number ? `Invoice ${r.invoice_number}` : r.deposit_reason ? `Deposit: ${r.deposit_reason}` : null,
    exception: r.exc_kind && r.exc_state ? { kind: r.exc_kind, state: r.exc_state, note: r.exc_note } : null,
  }));
}

export async function ledgerPage(scope: Scope, q: LedgerQuery, currency: string): Promise<LedgerPageDto> {
  await checkPeriod(scope, q.from, q.to);
  // The totals do not depend on the order, so they never join the owners for a sort.
  const f = filtered({ ...q, sort: 'date' });
  // Two independent reads: the totals of the whole filtered set and the page, side by side.
  const [[sum], items] = await Promise.all([
    boundSequelize().query<{ total: string; gross: string; fee: string; net: string }>(
      `SELECT count(*)::text AS total, COALESCE(SUM(l.gross), 0)::numeric(16,2)::text AS gross, COALESCE(SUM(l.fee), 0)::numeric(16,2)::text AS fee,
              COALESCE(SUM(l.net), 0)::numeric(16,2)::text AS net ${f.sql}`,
      { bind: [scope.workshopId, ...f.bind], type: QueryTypes.SELECT },
    ),
    rows(scope, q),
  ]);
  return {
    items,
    total: Number(sum!.total),
    page: q.page,
    pageSize: q.pageSize,
    totals: { gross: sum!.gross, fee: sum!.fee, net: sum!.net },
    currency,
  };
}

export async function ledgerAll(scope: Scope, q: LedgerQuery): Promise<LedgerRowDto[]> {
  await checkPeriod(scope, q.from, q.to);
  return rows(scope, q, true);
}
