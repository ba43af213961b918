import { QueryTypes } from 'sequelize';
import type { WeeklyMoneyDto } from '@wingstage/shared';
import { boundSequelize } from '../models/index.js';
import type { Scope } from '../services/scope.js';

/** Invoiced (after credit notes), received (kept) and paid out, per week (Monday first) for the last 13 weeks. */
export async function weeklyMoney(scope: Scope, currency: string, today: string = new Date().toISOString().slice(0, 10)): Promise<WeeklyMoneyDto> {
  const weeks = await boundSequelize().query<{ week_start: string; invoiced: string; received: string; paid_out: string }>(
    `WITH w AS (SELECT generate_series(date_trunc('week', $2::date) - interval '12 weeks', date_trunc('week', $2::date), interval '1 week')::date AS s)
     SELECT w.s::text AS week_start,
       ((SELECT COALESCE(SUM(i.gross), 0) FROM invoices i WHERE i.workshop_id = $1 AND i.issued_at >= w.s AND i.issued_at < w.s + 7)
        - (SELECT COALESCE(SUM(c.gross), 0) FROM credit_notes c WHERE c.workshop_id = $1 AND c.issued_at >= w.s AND c.issued_at < w.s + 7))::numeric(16,2)::text AS invoiced,
       (SELECT COALESCE(SUM(p.amount), 0) FROM payments p WHERE p.workshop_id = $1 AND p.amount IS NOT NULL AND p.received_at >= w.s AND p.received_at < w.s + 7)::numeric(16,2)::text AS received,
       (SELECT COALESCE(SUM(po.amount), 0) FROM payouts po WHERE po.workshop_id = $1 AND po.arrival_on >= w.s AND po.arrival_on < w.s + 7)::numeric(16,2)::text AS paid_out
     FROM w ORDER BY w.s`,
    { bind: [scope.workshopId, today], type: QueryTypes.SELECT },
  );
  return { currency, weeks: weeks.map((w) => ({ weekStart: w.week_start, invoiced: w.invoiced, received: w.received, paidOut: w.paid_out })) };
}
