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
// The two kinds of ledger row, each its own SELECT so a filter and an order on the row's columns
// reach its table's indexes (an appendrel member with its own WHERE cannot be flattened).
// The column types match exactly so that the UNION ALL of the two stays a plain append.
const PAYMENT_ROWS = `
  SELECT p.id, CASE WHEN p.method <> 'card' THEN 'offline' ELSE p.kind END AS kind, p.received_at AS at, p.job_id, p.currency,
         -- Money taken offline reaches the bank whole: no processor fee, net = gross.
         p.amount AS gross,
         CASE WHEN p.method <> 'card' THEN COALESCE(p.fee, 0) ELSE p.fee END AS fee,
         CASE WHEN p.method <> 'card' THEN COALESCE(p.net, p.amount) ELSE p.net END AS net,
         p.state AS status, NULL::uuid AS payment_id
    FROM payments p
   WHERE p.workshop_id = $1 AND p.amount IS NOT NULL AND p.received_at IS NOT NULL`;
const REFUND_ROWS = `
  SELECT r.id, 'refund'::text AS kind, r.created_at AS at, r.job_id, r.currency, -r.amount AS gross, 0::numeric AS fee, -r.amount AS net, r.state AS status, r.payment_id
    FROM refunds r
   WHERE r.workshop_id = $1 AND r.state <> 'failed'`;

// Date and gross are never null, so their orders keep PostgreSQL's default null placement and an
// index walk (migration 0180) serves them in either direction; the others sort the filtered rows.
const SORTS: Record<LedgerQuery['sort'], { by: string; nullsLast: boolean }> = {
  date: { by: 'l.at', nullsLast: false },
  gross: { by: 'l.gross', nullsLast: false },
  fee: { by: 'l.fee', nullsLast: true },
  net: { by: 'l.net', nullsLast: true },
  job: { by: 'j.number', nullsLast: true },
  owner: { by: 'c.name', nullsLast: true },
  kind: { by: 'l.kind', nullsLast: true },
};

const orderBy = (sort: LedgerQuery['sort'], dir: 'ASC' | 'DESC') => `${SORTS[sort].by} ${dir}${SORTS[sort].nullsLast ? ' NULLS LAST' : ''}, l.id ${dir}`;

// A day of the filter is a UTC day, as the day totals are kept (whatever the session's time zone).
const dayStart = (p: string) => `(${p}::date)::timestamp AT TIME ZONE 'UTC'`;

/**
 * The jobs a search names (job number, owner, registration): the ledger rows are then found by job.
 * Three lookups, each served by its column's trigram index (migration 0090), instead of one OR
 * across a join, which can only be checked row by row over every job.
 */
const searchedJobs = (p: string) =>
  `l.job_id IN (SELECT j2.id FROM jobs j2 WHERE j2.workshop_id = $1 AND j2.number ILIKE ${p}
                UNION SELECT j2.id FROM jobs j2 JOIN aircraft a2 ON a2.id = j2.aircraft_id WHERE j2.workshop_id = $1 AND a2.registration ILIKE ${p}
                UNION SELECT j2.id FROM jobs j2 JOIN aircraft a2 ON a2.id = j2.aircraft_id JOIN customers c2 ON c2.id = a2.customer_id
                       WHERE j2.workshop_id = $1 AND c2.name ILIKE ${p})`;

/**
 * The filtered rows, lean: the job, aircraft and owner are joined only when a sort needs them, so
 * counting and totalling reads the two money tables alone.
 */
function conditions(q: Pick<LedgerQuery, 'from' | 'to' | 'kind' | 'status' | 'q'>): { where: string; bind: unknown[] } {
  const bind: unknown[] = [];
  const where: string[] = [];
  const add = (v: unknown) => {
    bind.push(v);
    // A numbered bind placeholder; $1 is the workshop.
    return '$'.concat(String(bind.length + 1));
  };
  if (q.from) where.push(`l.at >= ${dayStart(add(q.from))}`);
  if (q.to) where.push(`l.at < ${dayStart(`(${add(q.to)}::date + 1)`)}`);
  if (q.kind) where.push(`l.kind = ${add(q.kind)}`);
  if (q.status) where.push(`l.status = ${add(q.status)}`);
  if (q.q) where.push(searchedJobs(add(likePattern(q.q))));
  return { where: where.length ? `WHERE ${where.join(' AND ')}` : '', bind };
}

const OWNER_JOINS = 'JOIN jobs j ON j.id = l.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id';

/** The filtered rows of both kinds, each kind filtered in its own SELECT so the filter reaches its table's indexes. */
function filtered(q: Pick<LedgerQuery, 'from' | 'to' | 'kind' | 'status' | 'q' | 'sort'>): { sql: string; bind: unknown[] } {
  const c = conditions(q);
  const joins = q.sort === 'job' || q.sort === 'owner' ? OWNER_JOINS : '';
  const each = (rowsSql: string) => `(SELECT l.* FROM (${rowsSql}) l ${c.where})`;
  return { sql: `FROM (${each(PAYMENT_ROWS)} UNION ALL ${each(REFUND_ROWS)}) l ${joins}`, bind: c.bind };
}

/**
 * The lean rows of one page in order. Sorted by a column of the row itself, each kind gives its own
 * first (offset + page size) rows in that order, from its index where one serves it, and the page
 * is cut from their merge: the same rows as sorting everything, without reading everything. A deep
 * page reads offset + page size entries of each index. Sorted by job or owner, or for the export,
 * every filtered row is joined and sorted.
 */
function pageSql(q: LedgerQuery, dir: 'ASC' | 'DESC', all: boolean): { sql: string; bind: unknown[] } {
  const offset = (q.page - 1) * q.pageSize;
  if (all || q.sort === 'job' || q.sort === 'owner') {
    const f = filtered(q);
    return { sql: `SELECT l.* ${f.sql} ORDER BY ${orderBy(q.sort, dir)} ${all ? '' : `LIMIT ${q.pageSize} OFFSET ${offset}`}`, bind: f.bind };
  }
  const c = conditions(q);
  const top = (rowsSql: string) => `(SELECT l.* FROM (${rowsSql}) l ${c.where} ORDER BY ${orderBy(q.sort, dir)} LIMIT ${offset + q.pageSize})`;
  return { sql: `SELECT l.* FROM (${top(PAYMENT_ROWS)} UNION ALL ${top(REFUND_ROWS)}) l ORDER BY ${orderBy(q.sort, dir)} LIMIT ${q.pageSize} OFFSET ${offset}`, bind: c.bind };
}

/**
 * The totals of the filtered set. Without a search they come from the day totals the payments and
 * refunds triggers keep (migration 0180): a few hundred rows instead of every payment; a search
 * sums its matching rows directly. Both are NUMERIC throughout.
 */
async function totalsOf(scope: Scope, q: LedgerQuery): Promise<{ total: string; gross: string; fee: string; net: string }> {
  if (q.q) {
    const f = filtered({ ...q, sort: 'date' });
    const [sum] = await boundSequelize().query<{ total: string; gross: string; fee: string; net: string }>(
      `SELECT count(*)::text AS total, COALESCE(SUM(l.gross), 0)::numeric(16,2)::text AS gross, COALESCE(SUM(l.fee), 0)::numeric(16,2)::text AS fee,
              COALESCE(SUM(l.net), 0)::numeric(16,2)::text AS net ${f.sql}`,
      { bind: [scope.workshopId, ...f.bind], type: QueryTypes.SELECT },
    );
    return sum!;
  }
  const bind: unknown[] = [scope.workshopId];
  const where = ['t.workshop_id = $1'];
  const add = (sql: (p: string) => string, v: unknown) => {
    bind.push(v);
    where.push(sql('$'.concat(String(bind.length))));
  };
  if (q.from) add((p) => `t.day >= ${p}::date`, q.from);
  if (q.to) add((p) => `t.day <= ${p}::date`, q.to);
  if (q.kind) add((p) => `t.kind = ${p}`, q.kind);
  if (q.status) add((p) => `t.status = ${p}`, q.status);
  const [sum] = await boundSequelize().query<{ total: string; gross: string; fee: string; net: string }>(
    `SELECT COALESCE(SUM(t.rows), 0)::text AS total, COALESCE(SUM(t.gross), 0)::numeric(16,2)::text AS gross,
            COALESCE(SUM(t.fee), 0)::numeric(16,2)::text AS fee, COALESCE(SUM(t.net), 0)::numeric(16,2)::text AS net
       FROM ledger_day_totals t WHERE ${where.join(' AND ')}`,
    { bind, type: QueryTypes.SELECT },
  );
  return sum!;
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
  const dir = q.dir === 'asc' ? 'ASC' : 'DESC';
  const f = pageSql(q, dir, all);
  const list = await boundSequelize().query<Row>(
    `WITH pg AS (
       SELECT l.id, l.kind, l.at, l.job_id, l.currency, l.gross, l.fee, l.net, l.status, l.payment_id
         FROM (${f.sql}) l
     )
     SELECT l.id, l.kind, l.at, l.job_id, j.number AS job_number, c.name AS owner_name, pm.method, l.currency, l.gross::text, l.fee::text, l.net::text, l.status,
            -- Each look-up on its own indexed column (an OR across two columns reads the whole table per row).
            COALESCE(CASE WHEN l.kind = 'refund' THEN rf.stripe_payout_id ELSE pm.stripe_payout_id END,
                     CASE WHEN l.kind = 'refund'
                          THEN (SELECT po.stripe_payout_id FROM payout_transactions pt JOIN payouts po ON po.id = pt.payout_id WHERE pt.refund_id = l.id LIMIT 1)
                          ELSE (SELECT po.stripe_payout_id FROM payout_transactions pt JOIN payouts po ON po.id = pt.payout_id WHERE pt.payment_id = l.id LIMIT 1) END) AS payout,
            CASE WHEN pm.invoice_id IS NOT NULL THEN (SELECT i.number FROM invoices i WHERE i.id = pm.invoice_id)
                 WHEN pm.kind = 'balance' THEN (SELECT i.number FROM invoices i WHERE i.job_id = pm.job_id LIMIT 1) END AS invoice_number,
            (SELECT d.reason FROM deposit_requests d WHERE d.id = pm.deposit_request_id) AS deposit_reason,
            e.kind AS exc_kind, e.state AS exc_state, e.note AS exc_note
       FROM pg l
       JOIN payments pm ON pm.id = COALESCE(l.payment_id, l.id)
       LEFT JOIN refunds rf ON l.kind = 'refund' AND rf.id = l.id
       JOIN jobs j ON j.id = l.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
       LEFT JOIN LATERAL (SELECT x.kind, x.state, x.note FROM account_exceptions x
                           WHERE x.workshop_id = $1 AND ((l.kind = 'refund' AND x.refund_id = l.id) OR (l.kind <> 'refund' AND x.payment_id = l.id AND x.refund_id IS NULL))
                           ORDER BY x.created_at DESC LIMIT 1) e ON true
      ORDER BY ${orderBy(q.sort, dir)}`,
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
  // Two independent reads: the totals of the whole filtered set and the page, side by side.
  const [sum, items] = await Promise.all([totalsOf(scope, q), rows(scope, q)]);
  return {
    items,
    total: Number(sum.total),
    page: q.page,
    pageSize: q.pageSize,
    totals: { gross: sum.gross, fee: sum.fee, net: sum.net },
    currency,
  };
}

export async function ledgerAll(scope: Scope, q: LedgerQuery): Promise<LedgerRowDto[]> {
  await checkPeriod(scope, q.from, q.to);
  return rows(scope, q, true);
}
