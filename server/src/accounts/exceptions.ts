import { QueryTypes } from 'sequelize';
import { EXCEPTION_KIND_LABELS, assertExceptionMove, type AccountExceptionDto, type ExceptionKind, type ExceptionState } from '@wingstage/shared';
import { notFound } from '../errors/app-error.js';
import { inTransaction } from '../db/transaction.js';
import { boundSequelize } from '../models/index.js';
import { lockJobById } from '../services/job-access.js';
import { recordAudit } from '../services/audit.js';
import type { Scope } from '../services/scope.js';

/**
 * Finds what does not match and records each once (one row per kind and subject; a resolved one is
 * never raised again). Payouts that do not add up are raised when they are fetched (payouts.ts).
 * Matching itself needs no row: a payment settles the invoice it names, or its job's invoice.
 */
export async function scanExceptions(workshopId: string, today: string = new Date().toISOString().slice(0, 10)): Promise<number> {
  const sequelize = boundSequelize();
  const found = await sequelize.query<{ n: string }>(
    `WITH found AS (
       -- A balance received on a job that has no invoice.
       SELECT 'paid_not_invoiced' AS kind, 'payment:' || p.id AS subject_key, p.job_id, p.id AS payment_id, NULL::uuid AS invoice_id, NULL::uuid AS refund_id,
              'Job ' || j.number || ': ' || p.amount::text || ' ' || p.currency || ' received as a balance on ' || to_char(p.received_at, 'YYYY-MM-DD') || ', but the job has no invoice.' AS reason
         FROM payments p JOIN jobs j ON j.id = p.job_id
        WHERE p.workshop_id = $1 AND p.kind = 'balance' AND p.state IN ('succeeded', 'partially_refunded')
          AND NOT EXISTS (SELECT 1 FROM invoices i WHERE i.job_id = p.job_id)
       UNION ALL
       -- An issued invoice still owed after its due date (the workshop's payment terms).
       SELECT 'unpaid_past_terms', 'invoice:' || i.id, i.job_id, NULL, i.id, NULL,
              'Invoice ' || i.number || ' was due on ' || i.due_on::text || ' and ' || owed.amount::text || ' ' || i.currency || ' is still owed.'
         FROM invoices i
         CROSS JOIN LATERAL (SELECT (i.gross - COALESCE((SELECT SUM(c.gross) FROM credit_notes c WHERE c.invoice_id = i.id), 0)
                - COALESCE((SELECT SUM(p.amount - p.refunded) FROM payments p WHERE p.job_id = i.job_id AND p.state IN ('succeeded', 'partially_refunded')), 0)) AS amount) owed
        WHERE i.workshop_id = $1 AND i.state = 'issued' AND i.due_on < $2::date AND owed.amount > 0
       UNION ALL
       -- Received a different amount from what was asked.
       SELECT 'amount_differs', 'payment:' || p.id, p.job_id, p.id, NULL, NULL,
              'Job ' || j.number || ': ' || p.expected_amount::text || ' ' || p.currency || ' was asked and ' || COALESCE(p.amount::text, 'nothing') || ' was received.'
         FROM payments p JOIN jobs j ON j.id = p.job_id
        WHERE p.workshop_id = $1 AND p.amount_mismatch
       UNION ALL
       -- Money handed back with no credit note to say why.
       SELECT 'refund_without_credit_note', 'refund:' || r.id, r.job_id, r.payment_id, NULL, r.id,
              'Job ' || j.number || ': a refund of ' || r.amount::text || ' ' || r.currency || ' on ' || to_char(r.created_at, 'YYYY-MM-DD') || ' has no credit note.'
         FROM refunds r JOIN jobs j ON j.id = r.job_id
        WHERE r.workshop_id = $1 AND r.state = 'succeeded' AND r.credit_note_id IS NULL
     ), ins AS (
       INSERT INTO account_exceptions (workshop_id, kind, subject_key, job_id, payment_id, invoice_id, refund_id, reason)
       SELECT $1, kind, subject_key, job_id, payment_id, invoice_id, refund_id, left(reason, 500) FROM found
       ON CONFLICT (workshop_id, kind, subject_key) DO NOTHING
       RETURNING 1
     )
     SELECT count(*)::text AS n FROM ins`,
    { bind: [workshopId, today], type: QueryTypes.SELECT },
  );
  return Number(found[0]?.n ?? 0);
}

type ExceptionRow = {
  id: string; kind: ExceptionKind; reason: string; state: ExceptionState; job_id: string | null; job_number: string | null; payment_id: string | null; invoice_id: string | null;
  refund_id: string | null; payout_id: string | null; created_at: Date; resolved_at: Date | null; resolved_by_name: string | null; note: string | null;
};

const SELECT_EXCEPTION = `
  SELECT e.id, e.kind, e.reason, e.state, e.job_id, j.number AS job_number, e.payment_id, e.invoice_id, e.refund_id, e.payout_id,
         e.created_at, e.resolved_at, u.name AS resolved_by_name, e.note
    FROM account_exceptions e LEFT JOIN jobs j ON j.id = e.job_id LEFT JOIN users u ON u.id = e.resolved_by`;

const toDto = (r: ExceptionRow): AccountExceptionDto => ({
  id: r.id,
  kind: r.kind,
  reason: r.reason,
  state: r.state,
  jobId: r.job_id,
  jobNumber: r.job_number,
  paymentId: r.payment_id,
  invoiceId: r.invoice_id,
  refundId: r.refund_id,
  payoutId: r.payout_id,
  createdAt: new Date(r.created_at).toISOString(),
  resolvedAt: r.resolved_at ? new Date(r.resolved_at).toISOString() : null,
  resolvedByName: r.resolved_by_name,
  note: r.note,
});

export async function listExceptions(scope: Scope, state: 'open' | 'resolved' | 'all'): Promise<AccountExceptionDto[]> {
  await scanExceptions(scope.workshopId);
  const rows = await boundSequelize().query<ExceptionRow>(
    `${SELECT_EXCEPTION} WHERE e.workshop_id = $1 AND ($2 = 'all' OR e.state = $2) ORDER BY e.state, e.created_at DESC, e.id LIMIT 500`,
    { bind: [scope.workshopId, state], type: QueryTypes.SELECT },
  );
  return rows.map(toDto);
}

/**
 * Resolving needs a note; the move goes through the exception state machine, and is written to
 * the job's history (or the workshop's, for a payout) in the same transaction. Lock order: the
 * job row first, then the exception.
 */
export async function resolveException(scope: Scope, id: string, note: string): Promise<AccountExceptionDto> {
  return inTransaction(async (t) => {
    const sequelize = boundSequelize();
    const [peek] = await sequelize.query<{ job_id: string | null }>(`SELECT job_id FROM account_exceptions WHERE id = $1 AND workshop_id = $2`, { bind: [id, scope.workshopId], type: QueryTypes.SELECT, transaction: t });
    if (!peek) throw notFound('That exception');
    if (peek.job_id) await lockJobById(peek.job_id, t);
    const [row] = await sequelize.query<{ state: ExceptionState; kind: ExceptionKind; reason: string }>(
      `SELECT state, kind, reason FROM account_exceptions WHERE id = $1 AND workshop_id = $2 FOR UPDATE`,
      { bind: [id, scope.workshopId], type: QueryTypes.SELECT, transaction: t },
    );
    if (!row) throw notFound('That exception');
    assertExceptionMove(row.state, 'resolved');
    await sequelize.query(`UPDATE account_exceptions SET state = 'resolved', resolved_by = $2, resolved_at = now(), note = $3 WHERE id = $1`, { bind: [id, scope.userId, note], transaction: t });
    await recordAudit(scope, t, {
      jobId: peek.job_id,
      action: 'accounts.exception_resolved',
      summary: `Accounts resolved "${EXCEPTION_KIND_LABELS[row.kind]}": ${note}`,
      detail: { exceptionId: id, kind: row.kind, reason: row.reason, note },
    });
    const [out] = await sequelize.query<ExceptionRow>(`${SELECT_EXCEPTION} WHERE e.id = $1`, { bind: [id], type: QueryTypes.SELECT, transaction: t });
    return toDto(out!);
  });
}
