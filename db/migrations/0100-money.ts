import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * The money after the owner's decision: deposit requests, payments (card and offline), refunds,
 * VAT invoices, credit notes and the counters that number them. Amounts are numeric(14,2) and travel
 * as decimal strings; the card processor's ids are unique so a repeated event finds its row.
 * State columns carry the states declared in shared/src/states.ts; the services' single writers
 * check every move against those tables before writing.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);

  // A deposit asked of the owner: raised by the workshop's policy when the owner accepts work, or by
  // the manager by hand. Cancellable while nothing has been paid against it.
  await q(`
    CREATE TABLE deposit_requests (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      -- quote_accepted / work_approved: raised by the policy on the owner's decision; manual: by staff.
      origin text NOT NULL CHECK (origin IN ('quote_accepted', 'work_approved', 'manual')),
      approval_request_id uuid REFERENCES approval_requests(id) ON DELETE SET NULL,
      reason text NOT NULL CHECK (length(reason) BETWEEN 1 AND 500),
      amount numeric(14,2) NOT NULL CHECK (amount > 0),
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      -- The job's VAT mix (gross per rate) when the deposit was asked, so its VAT is fixed on the
      -- mix the owner agreed to at the date received [VAT Act 1994 s6(4)].
      vat_mix jsonb NOT NULL DEFAULT '[]'::jsonb,
      state text NOT NULL DEFAULT 'waiting',
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      paid_at timestamptz,
      cancelled_at timestamptz,
      cancelled_by uuid REFERENCES users(id) ON DELETE SET NULL,
      cancel_reason text CHECK (cancel_reason IS NULL OR length(cancel_reason) <= 500),
      version integer NOT NULL DEFAULT 0,
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      UNIQUE (job_id, id),
      CHECK ((state = 'paid') = (paid_at IS NOT NULL)),
      CHECK ((state = 'cancelled') = (cancelled_at IS NOT NULL))
    )`);
  await q(`CREATE INDEX deposit_requests_job_idx ON deposit_requests (job_id, created_at)`);
  await q(`CREATE INDEX deposit_requests_waiting_idx ON deposit_requests (workshop_id, created_at) WHERE state = 'waiting'`);
  // The policy raises at most one deposit per decision, however often the decision is replayed.
  await q(`CREATE UNIQUE INDEX deposit_requests_one_per_decision ON deposit_requests (approval_request_id, origin) WHERE approval_request_id IS NOT NULL`);

  // VAT invoices: one per job, numbered per workshop without gaps, immutable once issued (the
  // document column holds every particular as issued; corrections are credit notes).
  await q(`
    CREATE TABLE invoices (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      seq integer NOT NULL CHECK (seq > 0),
      number text NOT NULL CHECK (length(number) BETWEEN 1 AND 40),
      state text NOT NULL DEFAULT 'issued',
      issued_at timestamptz NOT NULL DEFAULT now(),
      tax_point date NOT NULL,
      due_on date NOT NULL,
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      rounding text NOT NULL,
      net numeric(14,2) NOT NULL,
      vat numeric(14,2) NOT NULL,
      gross numeric(14,2) NOT NULL,
      -- Deposits already received and shown on the invoice with their own tax points.
      deposits_gross numeric(14,2) NOT NULL DEFAULT 0,
      -- What the owner owed at issue: gross less deposits received.
      balance_due numeric(14,2) NOT NULL,
      document jsonb NOT NULL,
      issued_by uuid REFERENCES users(id) ON DELETE SET NULL,
      paid_at timestamptz,
      version integer NOT NULL DEFAULT 0,
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      UNIQUE (workshop_id, seq),
      UNIQUE (workshop_id, number),
      UNIQUE (job_id),
      UNIQUE (job_id, id),
      CHECK (net + vat = gross)
    )`);
  await q(`CREATE INDEX invoices_workshop_issued_idx ON invoices (workshop_id, issued_at DESC)`);
  await q(`CREATE INDEX invoices_workshop_state_idx ON invoices (workshop_id, state, due_on)`);

  await q(`
    CREATE TABLE credit_notes (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      invoice_id uuid NOT NULL REFERENCES invoices(id) ON DELETE RESTRICT,
      seq integer NOT NULL CHECK (seq > 0),
      number text NOT NULL CHECK (length(number) BETWEEN 1 AND 40),
      issued_at timestamptz NOT NULL DEFAULT now(),
      -- The credit note's own date (reg 38): the tax point of the reduction.
      tax_point date NOT NULL,
      reason text NOT NULL CHECK (length(reason) BETWEEN 1 AND 500),
      net numeric(14,2) NOT NULL CHECK (net >= 0),
      vat numeric(14,2) NOT NULL CHECK (vat >= 0),
      gross numeric(14,2) NOT NULL CHECK (gross > 0),
      document jsonb NOT NULL,
      issued_by uuid REFERENCES users(id) ON DELETE SET NULL,
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      UNIQUE (workshop_id, seq),
      UNIQUE (workshop_id, number),
      CHECK (net + vat = gross)
    )`);
  await q(`CREATE INDEX credit_notes_invoice_idx ON credit_notes (invoice_id)`);
  await q(`CREATE INDEX credit_notes_workshop_issued_idx ON credit_notes (workshop_id, issued_at DESC)`);

  // Gap-free numbering: the issuing transaction locks this row, takes next_value and increments it,
  // so a rolled-back issue gives its number back (a database sequence would skip it).
  await q(`
    CREATE TABLE document_counters (
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      kind text NOT NULL CHECK (kind IN ('invoice', 'credit_note')),
      prefix text NOT NULL CHECK (length(prefix) BETWEEN 0 AND 12),
      next_value integer NOT NULL DEFAULT 1 CHECK (next_value > 0),
      PRIMARY KEY (workshop_id, kind)
    )`);

  // Every amount received: a deposit or a balance by card through a Checkout Session, or an
  // offline payment recorded by accounts. A card payment row exists from the moment a session is
  // opened (pending) and is settled by the processor's events or by reading the session back.
  await q(`
    CREATE TABLE payments (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      kind text NOT NULL CHECK (kind IN ('deposit', 'balance')),
      method text NOT NULL CHECK (method IN ('card', 'bank_transfer', 'cash', 'cheque')),
      deposit_request_id uuid REFERENCES deposit_requests(id) ON DELETE RESTRICT,
      invoice_id uuid REFERENCES invoices(id) ON DELETE RESTRICT,
      state text NOT NULL DEFAULT 'pending',
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      -- What was asked when the payment was opened, and what was actually received (gross).
      expected_amount numeric(14,2) NOT NULL CHECK (expected_amount > 0),
      amount numeric(14,2) CHECK (amount IS NULL OR amount > 0),
      fee numeric(14,2) CHECK (fee IS NULL OR fee >= 0),
      net numeric(14,2),
      refunded numeric(14,2) NOT NULL DEFAULT 0 CHECK (refunded >= 0),
      -- Set when the amount received differs from what was asked: kept and flagged for accounts.
      amount_mismatch boolean NOT NULL DEFAULT false,
      stripe_checkout_session_id text UNIQUE,
      stripe_payment_intent_id text UNIQUE,
      stripe_charge_id text UNIQUE,
      stripe_balance_transaction_id text UNIQUE,
      stripe_payout_id text,
      failure_code text,
      failure_message text,
      -- Why a payment ended other than paid (e.g. expired because another session for the same
      -- deposit was paid, or refunded as a second payment for it).
      outcome_note text,
      -- The date received: the tax point of a deposit [VAT Act 1994 s6(4)].
      received_at timestamptz,
      reference text CHECK (reference IS NULL OR length(reference) <= 200),
      recorded_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      version integer NOT NULL DEFAULT 0,
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      CHECK (kind <> 'deposit' OR deposit_request_id IS NOT NULL),
      CHECK (method = 'card' OR (stripe_checkout_session_id IS NULL AND stripe_payment_intent_id IS NULL)),
      CHECK (amount IS NULL OR fee IS NULL OR net = amount - fee),
      CHECK (amount IS NULL OR refunded <= amount)
    )`);
  await q(`CREATE INDEX payments_job_idx ON payments (job_id, created_at)`);
  await q(`CREATE INDEX payments_deposit_request_idx ON payments (deposit_request_id) WHERE deposit_request_id IS NOT NULL`);
  await q(`CREATE INDEX payments_invoice_idx ON payments (invoice_id) WHERE invoice_id IS NOT NULL`);
  await q(`CREATE INDEX payments_workshop_received_idx ON payments (workshop_id, received_at DESC NULLS LAST, id)`);
  await q(`CREATE INDEX payments_workshop_state_idx ON payments (workshop_id, state, created_at DESC)`);
  await q(`CREATE INDEX payments_payout_idx ON payments (stripe_payout_id) WHERE stripe_payout_id IS NOT NULL`);

  // Money handed back: by card through the processor (always with a credit note, except when a
  // duplicate payment is returned), or recorded for an offline payment.
  await q(`
    CREATE TABLE refunds (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid NOT NULL,
      payment_id uuid NOT NULL REFERENCES payments(id) ON DELETE RESTRICT,
      credit_note_id uuid REFERENCES credit_notes(id) ON DELETE RESTRICT,
      amount numeric(14,2) NOT NULL CHECK (amount > 0),
      currency text NOT NULL CHECK (currency ~ '^[A-Z]{3}$'),
      state text NOT NULL DEFAULT 'pending' CHECK (state IN ('pending', 'succeeded', 'failed')),
      reason text NOT NULL CHECK (length(reason) BETWEEN 1 AND 500),
      stripe_refund_id text UNIQUE,
      stripe_balance_transaction_id text UNIQUE,
      stripe_payout_id text,
      created_by uuid REFERENCES users(id) ON DELETE SET NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE
    )`);
  await q(`CREATE INDEX refunds_payment_idx ON refunds (payment_id)`);
  await q(`CREATE INDEX refunds_workshop_created_idx ON refunds (workshop_id, created_at DESC)`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  for (const t of ['refunds', 'payments', 'document_counters', 'credit_notes', 'invoices', 'deposit_requests']) {
    await q(`DROP TABLE IF EXISTS ${t} CASCADE`);
  }
}
