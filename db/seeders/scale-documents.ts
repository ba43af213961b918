/**
 * Invoices, credit notes and deposits in proportion to the benchmark's 10,000 jobs, so the invoice,
 * credit-note, deposit and aged-debt lists have a busy workshop's rows. Set-based, like the rest of
 * the scale seed; every amount is worked in NUMERIC by PostgreSQL.
 *
 * - An invoice for every job ready for release or closed (2 in 7 jobs, about 2,860), numbered on from
 *   the workshop's counter. Its gross is what the job received (the bulk payments, less refunds);
 *   one in three is issued for £150.00 more than that, so it is still owed and ages.
 * - A credit note on every tenth invoice, for a tenth of its gross.
 * - A deposit asked on every fifth job (2,000): two in three paid by card (a deposit payment with
 *   the fake's fee), the rest still waiting.
 * The document JSON is a marker ({"bulk": true}): these PDFs are never opened.
 */
export async function seedScaleDocuments(step: (what: string, sql: string) => Promise<void>): Promise<void> {
  await step('invoices', `
    WITH counter AS (SELECT next_value FROM document_counters WHERE workshop_id = $1 AND kind = 'invoice'),
    picked AS (
      SELECT j.k, j.id AS job_id, row_number() OVER (ORDER BY j.k) AS n,
             COALESCE((SELECT SUM(p.amount - p.refunded) FROM payments p WHERE p.job_id = j.id AND p.state IN ('succeeded', 'partially_refunded')), 0)
               + CASE WHEN j.k % 3 = 0 THEN 150.00 ELSE 0 END AS gross
        FROM scale_jobs j JOIN jobs jj ON jj.id = j.id
       WHERE jj.state IN ('ready_for_release', 'closed')
    )
    INSERT INTO invoices (workshop_id, job_id, seq, number, state, issued_at, tax_point, due_on, currency, rounding, net, vat, gross, deposits_gross, balance_due, document, paid_at)
    SELECT $1, p.job_id, c.next_value + p.n - 1, 'INV-' || lpad((c.next_value + p.n - 1)::text, 5, '0'),
           CASE WHEN p.k % 3 = 0 THEN 'issued' ELSE 'paid' END,
           TIMESTAMPTZ '2024-01-10 10:00Z' + (p.k * interval '95 minutes'), (TIMESTAMPTZ '2024-01-10 10:00Z' + (p.k * interval '95 minutes'))::date,
           (TIMESTAMPTZ '2024-01-10 10:00Z' + (p.k * interval '95 minutes'))::date + 30, 'GBP', 'invoice-nearest',
           p.gross - round(p.gross / 6, 2), round(p.gross / 6, 2), p.gross, 0, p.gross, '{"bulk": true}'::jsonb,
           CASE WHEN p.k % 3 = 0 THEN NULL ELSE TIMESTAMPTZ '2024-01-12 10:00Z' + (p.k * interval '95 minutes') END
      FROM picked p CROSS JOIN counter c`);
  await step('invoice counter', `
    UPDATE document_counters SET next_value = (SELECT MAX(seq) + 1 FROM invoices WHERE workshop_id = $1) WHERE workshop_id = $1 AND kind = 'invoice'`);
  await step('credit notes', `
    WITH counter AS (SELECT next_value FROM document_counters WHERE workshop_id = $1 AND kind = 'credit_note'),
    picked AS (
      SELECT i.id, i.job_id, i.gross, i.issued_at, row_number() OVER (ORDER BY i.seq) AS n
        FROM invoices i JOIN scale_jobs j ON j.id = i.job_id WHERE i.workshop_id = $1
    ),
    tenth AS (SELECT *, row_number() OVER (ORDER BY n) AS m FROM picked WHERE n % 10 = 0 AND round(gross / 10, 2) > 0)
    INSERT INTO credit_notes (workshop_id, job_id, invoice_id, seq, number, issued_at, tax_point, reason, net, vat, gross, document)
    SELECT $1, t.job_id, t.id, c.next_value + t.m - 1, 'CN-' || lpad((c.next_value + t.m - 1)::text, 5, '0'),
           t.issued_at + interval '5 days', (t.issued_at + interval '5 days')::date, 'Goodwill reduction (bulk row).',
           round(t.gross / 10, 2) - round(round(t.gross / 10, 2) / 6, 2), round(round(t.gross / 10, 2) / 6, 2), round(t.gross / 10, 2), '{"bulk": true}'::jsonb
      FROM tenth t CROSS JOIN counter c`);
  await step('credit note counter', `
    UPDATE document_counters SET next_value = COALESCE((SELECT MAX(seq) + 1 FROM credit_notes WHERE workshop_id = $1), next_value) WHERE workshop_id = $1 AND kind = 'credit_note'`);
  await step('deposits', `
    INSERT INTO deposit_requests (workshop_id, job_id, origin, reason, amount, currency, state, created_at, updated_at, paid_at)
    SELECT $1, j.id, 'manual', 'Parts on order (bulk row)', (50 + j.k % 400)::numeric(14,2), 'GBP',
           CASE WHEN j.k % 3 = 0 THEN 'waiting' ELSE 'paid' END,
           TIMESTAMPTZ '2024-01-05 10:00Z' + (j.k * interval '100 minutes'), TIMESTAMPTZ '2024-01-05 10:00Z' + (j.k * interval '100 minutes'),
           CASE WHEN j.k % 3 = 0 THEN NULL ELSE TIMESTAMPTZ '2024-01-06 10:00Z' + (j.k * interval '100 minutes') END
      FROM scale_jobs j WHERE j.k % 5 = 0`);
  await step('deposit payments', `
    INSERT INTO payments (workshop_id, job_id, kind, method, deposit_request_id, state, currency, expected_amount, amount, fee, net, received_at, created_at)
    SELECT d.workshop_id, d.job_id, 'deposit', 'card', d.id, 'succeeded', d.currency, d.amount, d.amount, fee.v, d.amount - fee.v, d.paid_at, d.created_at
      FROM deposit_requests d JOIN scale_jobs j ON j.id = d.job_id
      CROSS JOIN LATERAL (SELECT (round(d.amount * 1.5) / 100 + 0.20)::numeric(14,2) AS v) fee
     WHERE d.workshop_id = $1 AND d.state = 'paid'`);
}
