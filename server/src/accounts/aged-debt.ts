import { QueryTypes } from 'sequelize';
import { Dec, formatAmount, formatMoney, minorUnits, workshopToday, type AgedDebtDto, type AgedDebtRowDto } from '@wingstage/shared';
import { notFound } from '../errors/app-error.js';
import { inTransaction } from '../db/transaction.js';
import type { MailMessage } from '../mail/mail-queue.js';
import { boundSequelize } from '../models/index.js';
import { recordAudit } from '../services/audit.js';
import type { Deps } from '../services/deps.js';
import type { Scope } from '../services/scope.js';

type Row = { customer_id: string; owner_name: string; email: string | null; invoice_id: string; number: string; due_on: string; owed: string; days: number; job_id: string; currency: string };

/**
 * What each owner still owes on issued invoices (the invoice after credit notes, less everything
 * received on the job and kept), aged from each invoice's due date: 0–30 days (not yet due
 * included), 31–60, 61–90, over 90 [ageing from the due date: common practice].
 */
const OWED_SQL = `SELECT c.id AS customer_id, c.name AS owner_name, c.email, i.id AS invoice_id, i.number, i.due_on::text, owed.amount AS owed,
            GREATEST(($2::date - i.due_on), 0) AS days, i.job_id, i.currency
       FROM invoices i
       JOIN jobs j ON j.id = i.job_id JOIN aircraft a ON a.id = j.aircraft_id JOIN customers c ON c.id = a.customer_id
       CROSS JOIN LATERAL (SELECT (i.gross - COALESCE((SELECT SUM(cn.gross) FROM credit_notes cn WHERE cn.invoice_id = i.id), 0)
              - COALESCE((SELECT SUM(p.amount - p.refunded) FROM payments p WHERE p.job_id = i.job_id AND p.state IN ('succeeded', 'partially_refunded')), 0)) AS amount) owed
      WHERE i.workshop_id = $1 AND i.state = 'issued' AND owed.amount > 0 AND ($3::uuid IS NULL OR c.id = $3::uuid)`;

async function owedRows(scope: Scope, asOf: string, customerId?: string): Promise<Row[]> {
  return boundSequelize().query<Row>(`SELECT customer_id, owner_name, email, invoice_id, number, due_on, owed::text AS owed, days, job_id, currency FROM (${OWED_SQL}) o ORDER BY o.owner_name, o.customer_id, o.due_on`, {
    bind: [scope.workshopId, asOf, customerId ?? null],
    type: QueryTypes.SELECT,
  });
}

type PageRow = Partial<Row> & { owners: number; t0_30: string; t31_60: string; t61_90: string; tover90: string };

/**
 * One page of owners (by name) with their invoices, and in the same statement the totals of every
 * bucket over all owners, so the foot of the table adds up the whole list on every page.
 */
async function owedPage(scope: Scope, asOf: string, page: number, pageSize: number): Promise<PageRow[]> {
  return boundSequelize().query<PageRow>(
    `WITH o AS MATERIALIZED (${OWED_SQL}),
          t AS (SELECT count(DISTINCT customer_id)::int AS owners,
                       COALESCE(SUM(owed) FILTER (WHERE days <= 30), 0)::text AS t0_30,
                       COALESCE(SUM(owed) FILTER (WHERE days > 30 AND days <= 60), 0)::text AS t31_60,
                       COALESCE(SUM(owed) FILTER (WHERE days > 60 AND days <= 90), 0)::text AS t61_90,
                       COALESCE(SUM(owed) FILTER (WHERE days > 90), 0)::text AS tover90
                  FROM o),
          pg AS (SELECT customer_id, owner_name FROM o GROUP BY customer_id, owner_name ORDER BY owner_name, customer_id LIMIT $4 OFFSET $5)
     SELECT t.*, r.customer_id, r.owner_name, r.email, r.invoice_id, r.number, r.due_on, r.owed::text AS owed, r.days, r.job_id, r.currency
       FROM t LEFT JOIN (SELECT o.* FROM o JOIN pg USING (customer_id)) r ON true
      ORDER BY r.owner_name, r.customer_id, r.due_on`,
    { bind: [scope.workshopId, asOf, null, pageSize, (page - 1) * pageSize], type: QueryTypes.SELECT },
  );
}

const BUCKETS = ['d0_30', 'd31_60', 'd61_90', 'over90'] as const;
export function bucketOf(days: number): (typeof BUCKETS)[number] {
  return days <= 30 ? 'd0_30' : days <= 60 ? 'd31_60' : days <= 90 ? 'd61_90' : 'over90';
}

/**
 * Accounts' aged debt: a page of owners (by name, `pageSize` a page) with what each owes by age, and
 * the totals of the whole list whatever the page. `asOf` is today on the workshop's clock.
 */
export async function agedDebt(scope: Scope, currency: string, q: { page: number; pageSize: number } = { page: 1, pageSize: 50 }, asOf: string = workshopToday()): Promise<AgedDebtDto> {
  const dp = minorUnits(currency);
  const list = await owedPage(scope, asOf, q.page, q.pageSize);
  const head = list[0]!;
  const byOwner = new Map<string, { row: Omit<AgedDebtRowDto, 'buckets' | 'total'>; sums: Record<(typeof BUCKETS)[number], Dec> }>();
  for (const r of list) {
    if (!r.customer_id) continue;
    let o = byOwner.get(r.customer_id);
    if (!o) {
      o = { row: { customerId: r.customer_id, ownerName: r.owner_name!, email: r.email ?? null, invoices: [] }, sums: Object.fromEntries(BUCKETS.map((b) => [b, new Dec(0)])) as Record<(typeof BUCKETS)[number], Dec> };
      byOwner.set(r.customer_id, o);
    }
    o.row.invoices.push({ id: r.invoice_id!, number: r.number!, dueOn: r.due_on!, owed: r.owed!, daysOverdue: Number(r.days) });
    const b = bucketOf(Number(r.days));
    o.sums[b] = o.sums[b].plus(r.owed!);
  }
  const fmt = (d: Dec) => formatAmount(d, dp);
  const rows = [...byOwner.values()].map(({ row, sums }) => ({
    ...row,
    buckets: { d0_30: fmt(sums.d0_30), d31_60: fmt(sums.d31_60), d61_90: fmt(sums.d61_90), over90: fmt(sums.over90) },
    total: fmt(BUCKETS.reduce((a, b) => a.plus(sums[b]), new Dec(0))),
  }));
  const totals = { d0_30: new Dec(head.t0_30), d31_60: new Dec(head.t31_60), d61_90: new Dec(head.t61_90), over90: new Dec(head.tover90) };
  return {
    asOf,
    currency,
    rows,
    page: q.page,
    pageSize: q.pageSize,
    ownerCount: head.owners,
    totals: { d0_30: fmt(totals.d0_30), d31_60: fmt(totals.d31_60), d61_90: fmt(totals.d61_90), over90: fmt(totals.over90), total: fmt(BUCKETS.reduce((a, b) => a.plus(totals[b]), new Dec(0))) },
  };
}

export function debtReminderMail(p: { to: string; ownerName: string; workshopName: string; contact: string; invoices: { number: string; dueOn: string; owed: string }[]; currency: string }): MailMessage {
  const lines = [
    `Hello ${p.ownerName},`,
    `This is a reminder from ${p.workshopName}: our records show the following still to pay.`,
    ...p.invoices.map((i) => `Invoice ${i.number}, due ${i.dueOn}: ${formatMoney(i.owed, p.currency)} to pay.`),
    `If you have paid in the last few days, thank you, and please ignore this e-mail. Any questions: ${p.contact}.`,
  ];
  const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);
  return {
    to: p.to,
    subject: `Payment reminder from ${p.workshopName}`,
    text: `${lines.join('\n\n')}\n`,
    html: `<!doctype html><html><body style="font-family:sans-serif;font-size:16px;line-height:1.5;color:#1d2430">${lines.map((l) => `<p style="margin:0 0 14px">${esc(l)}</p>`).join('')}</body></html>`,
  };
}

/** A reminder e-mail to one owner listing what they owe; written to each job's history. */
export async function sendDebtReminder(deps: Deps, scope: Scope, customerId: string, workshop: { name: string; currency: string; contact: string }): Promise<{ sentTo: string; invoices: number }> {
  const list = await owedRows(scope, workshopToday(), customerId);
  if (list.length === 0) throw notFound('Money owed by that owner');
  const first = list[0]!;
  if (!first.email) throw notFound('An e-mail address for that owner');
  return inTransaction(async (t) => {
    await deps.mail.enqueue(debtReminderMail({ to: first.email!, ownerName: first.owner_name, workshopName: workshop.name, contact: workshop.contact, invoices: list.map((r) => ({ number: r.number, dueOn: r.due_on, owed: r.owed })), currency: first.currency }), t);
    for (const r of list) {
      await recordAudit(scope, t, { jobId: r.job_id, action: 'accounts.debt_reminder', summary: `Payment reminder e-mailed to ${first.owner_name}: invoice ${r.number}, ${formatMoney(r.owed, r.currency)} to pay`, detail: { invoiceId: r.invoice_id, owed: r.owed } });
    }
    return { sentTo: first.email!, invoices: list.length };
  });
}
