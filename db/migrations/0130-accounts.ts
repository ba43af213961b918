import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Accounts: the payouts the card processor sent to the bank, the balance transactions each one
 * gathered (gross, fee, net, and the payment or refund they belong to), and the exceptions accounts
 * works through (something that does not match, kept until a person resolves it with a note).
 * A payout whose transactions do not add up is stored as fetched and flagged: never adjusted.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);

  await q(`
    CREATE TABLE payouts (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      -- The workshop whose payments the payout carried; null while none of its transactions is known.
      workshop_id uuid REFERENCES workshops(id) ON DELETE CASCADE,
      stripe_payout_id text NOT NULL UNIQUE,
      amount numeric(14,2) NOT NULL,
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      status text NOT NULL CHECK (status IN ('pending', 'in_transit', 'paid', 'failed', 'canceled')),
      arrival_on date NOT NULL,
      -- Σ net of the payout's balance transactions (its own left out), and whether it equals amount.
      transactions_net numeric(14,2) NOT NULL,
      transactions_count integer NOT NULL CHECK (transactions_count >= 0),
      adds_up boolean NOT NULL,
      fetched_at timestamptz NOT NULL DEFAULT now(),
      created_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX payouts_workshop_arrival_idx ON payouts (workshop_id, arrival_on DESC)`);

  await q(`
    CREATE TABLE payout_transactions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      payout_id uuid NOT NULL REFERENCES payouts(id) ON DELETE CASCADE,
      stripe_balance_transaction_id text NOT NULL UNIQUE,
      type text NOT NULL CHECK (length(type) BETWEEN 1 AND 60),
      source_id text,
      gross numeric(14,2) NOT NULL,
      fee numeric(14,2) NOT NULL,
      net numeric(14,2) NOT NULL,
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      occurred_at timestamptz NOT NULL,
      payment_id uuid REFERENCES payments(id) ON DELETE SET NULL,
      refund_id uuid REFERENCES refunds(id) ON DELETE SET NULL,
      CHECK (net = gross - fee)
    )`);
  await q(`CREATE INDEX payout_transactions_payout_idx ON payout_transactions (payout_id, occurred_at)`);
  await q(`CREATE INDEX payout_transactions_payment_idx ON payout_transactions (payment_id) WHERE payment_id IS NOT NULL`);

  await q(`
    CREATE TABLE account_exceptions (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      kind text NOT NULL CHECK (kind IN ('paid_not_invoiced', 'unpaid_past_terms', 'amount_differs', 'refund_without_credit_note', 'payout_does_not_add_up')),
      -- What it is about: one key per subject so finding it again never makes a second row.
      subject_key text NOT NULL CHECK (length(subject_key) BETWEEN 1 AND 200),
      job_id uuid REFERENCES jobs(id) ON DELETE CASCADE,
      payment_id uuid REFERENCES payments(id) ON DELETE CASCADE,
      invoice_id uuid REFERENCES invoices(id) ON DELETE CASCADE,
      refund_id uuid REFERENCES refunds(id) ON DELETE CASCADE,
      payout_id uuid REFERENCES payouts(id) ON DELETE CASCADE,
      reason text NOT NULL CHECK (length(reason) BETWEEN 1 AND 500),
      state text NOT NULL DEFAULT 'open' CHECK (state IN ('open', 'resolved')),
      resolved_by uuid REFERENCES users(id) ON DELETE SET NULL,
      resolved_at timestamptz,
      note text CHECK (note IS NULL OR length(note) BETWEEN 1 AND 1000),
      created_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (workshop_id, kind, subject_key),
      CHECK ((state = 'resolved') = (resolved_at IS NOT NULL AND note IS NOT NULL))
    )`);
  await q(`CREATE INDEX account_exceptions_open_idx ON account_exceptions (workshop_id, state, created_at DESC)`);
  await q(`CREATE INDEX account_exceptions_payment_idx ON account_exceptions (payment_id) WHERE payment_id IS NOT NULL`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  for (const t of ['account_exceptions', 'payout_transactions', 'payouts']) await q(`DROP TABLE IF EXISTS ${t} CASCADE`);
}
