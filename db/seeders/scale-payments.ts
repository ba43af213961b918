/**
 * The ledger's share of the benchmark's data set: 100,000 payments over the 10,000 bulk jobs (ten
 * each), received from 2024 on, four in five by card (with the fake's fee: 1.5 % half-up + 20p)
 * and one in five by bank transfer, plus a refund on every fiftieth. Set-based, like the rest of
 * the scale seed; amounts are worked in NUMERIC by PostgreSQL.
 */
export const SCALE_PAYMENTS = 100_000;

export async function seedScalePayments(step: (what: string, sql: string) => Promise<void>): Promise<void> {
  await step('payments', `
    INSERT INTO payments (workshop_id, job_id, kind, method, state, currency, expected_amount, amount, fee, net, received_at, reference, created_at)
    SELECT $1, j.id, 'balance', CASE WHEN g % 5 = 0 THEN 'bank_transfer' ELSE 'card' END, 'succeeded', 'GBP', amt.v, amt.v, fee.v, amt.v - fee.v,
           TIMESTAMPTZ '2024-01-01 09:00Z' + (g * interval '9 minutes'), CASE WHEN g % 5 = 0 THEN 'BACS ' || g END,
           TIMESTAMPTZ '2024-01-01 09:00Z' + (g * interval '9 minutes')
    FROM generate_series(1, ${SCALE_PAYMENTS}) g
    JOIN scale_jobs j ON j.k = 1 + (g - 1) % 10000
    CROSS JOIN LATERAL (SELECT (20 + (g * 7919) % 250000 / 100.0)::numeric(14,2) AS v) amt
    CROSS JOIN LATERAL (SELECT CASE WHEN g % 5 = 0 THEN 0::numeric(14,2) ELSE (round(amt.v * 1.5) / 100 + 0.20)::numeric(14,2) END AS v) fee`);
  await step('refunds', `
    INSERT INTO refunds (workshop_id, job_id, payment_id, amount, currency, state, reason, created_at)
    SELECT p.workshop_id, p.job_id, p.id, round(p.amount / 2, 2), 'GBP', 'succeeded', 'Part returned unused (bulk row).', p.received_at + interval '3 days'
    FROM (SELECT p.*, row_number() OVER (ORDER BY p.received_at) AS n FROM payments p JOIN scale_jobs j ON j.id = p.job_id WHERE p.workshop_id = $1) p
    WHERE p.n % 50 = 0`);
  await step('refunded amounts', `
    UPDATE payments p SET refunded = r.amount, state = 'partially_refunded' FROM refunds r WHERE r.payment_id = p.id AND p.workshop_id = $1 AND r.reason = 'Part returned unused (bulk row).'`);
}
