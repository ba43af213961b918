import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * The accounts ledger at a busy workshop's scale (100,000 payments).
 *
 * 1. Day totals. The ledger's totals cover the whole filtered set; summing 100,000 rows on every
 *    page view cost most of its time. `ledger_day_totals` holds, per workshop, UTC day, ledger kind
 *    and status, the number of ledger rows and their gross, fee and net, in NUMERIC. Triggers on
 *    payments and refunds keep it in the same transaction as the row that changed, whichever code
 *    path wrote it (card events, offline payments, refunds, credit notes, the scale seed): take the
 *    row's old contribution out and put its new one in, with one upsert per touched bucket. The
 *    kind and fee/net rules are the ledger's own (server/src/accounts/ledger.ts): money taken
 *    offline is kind 'offline' with no fee and net = gross; a refund counts negative; a card
 *    session never paid is not a ledger row. Searches by job, owner or registration still sum the
 *    matching rows directly.
 *
 * 2. Indexes in the ledger's sort orders, restricted to the rows the ledger shows, so the first
 *    page (and a deep page) is a merge of two index walks instead of a sort of every row.
 */
const INDEXES: [name: string, sql: string][] = [
  ['payments_ledger_at_idx', `payments (workshop_id, received_at DESC, id DESC) WHERE amount IS NOT NULL AND received_at IS NOT NULL`],
  ['payments_ledger_gross_idx', `payments (workshop_id, amount DESC, id DESC) WHERE amount IS NOT NULL AND received_at IS NOT NULL`],
  ['refunds_ledger_at_idx', `refunds (workshop_id, created_at DESC, id DESC) WHERE state <> 'failed'`],
  ['refunds_ledger_gross_idx', `refunds (workshop_id, (-amount) DESC, id DESC) WHERE state <> 'failed'`],
  ['refunds_job_idx', `refunds (job_id)`],
];

export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  for (const [name, on] of INDEXES) await q(`CREATE INDEX IF NOT EXISTS ${name} ON ${on}`);

  await q(`
    CREATE TABLE ledger_day_totals (
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      day date NOT NULL,
      kind text NOT NULL,
      status text NOT NULL,
      -- No CHECK (rows >= 0): an upsert's proposed row is checked before its conflict is found, and
      -- taking a row out proposes a negative one.
      rows integer NOT NULL,
      gross numeric(16,2) NOT NULL,
      fee numeric(16,2) NOT NULL,
      net numeric(16,2) NOT NULL,
      PRIMARY KEY (workshop_id, day, kind, status)
    )`);

  // Adds (sign 1) or takes out (sign -1) one ledger row's contribution to its day's bucket.
  await q(`
    CREATE FUNCTION ledger_day_add(w uuid, at timestamptz, k text, s text, g numeric, f numeric, n numeric, sign integer) RETURNS void
    LANGUAGE sql AS $$
      INSERT INTO ledger_day_totals AS t (workshop_id, day, kind, status, rows, gross, fee, net)
      VALUES (w, (at AT TIME ZONE 'UTC')::date, k, s, sign, sign * g, sign * f, sign * n)
      ON CONFLICT (workshop_id, day, kind, status) DO UPDATE
        SET rows = t.rows + EXCLUDED.rows, gross = t.gross + EXCLUDED.gross, fee = t.fee + EXCLUDED.fee, net = t.net + EXCLUDED.net
    $$`);

  await q(`
    CREATE FUNCTION payments_ledger_day_totals() RETURNS trigger
    LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP IN ('UPDATE', 'DELETE') AND OLD.amount IS NOT NULL AND OLD.received_at IS NOT NULL THEN
        IF TG_OP = 'UPDATE' AND NEW.amount IS NOT DISTINCT FROM OLD.amount AND NEW.received_at IS NOT DISTINCT FROM OLD.received_at
           AND NEW.fee IS NOT DISTINCT FROM OLD.fee AND NEW.net IS NOT DISTINCT FROM OLD.net AND NEW.state = OLD.state
           AND NEW.kind = OLD.kind AND NEW.method = OLD.method AND NEW.workshop_id = OLD.workshop_id THEN
          RETURN NULL;
        END IF;
        PERFORM ledger_day_add(OLD.workshop_id, OLD.received_at, CASE WHEN OLD.method <> 'card' THEN 'offline' ELSE OLD.kind END, OLD.state,
          OLD.amount, COALESCE(OLD.fee, 0),
          CASE WHEN OLD.method <> 'card' THEN COALESCE(OLD.net, OLD.amount) ELSE COALESCE(OLD.net, 0) END, -1);
      END IF;
      IF TG_OP IN ('INSERT', 'UPDATE') AND NEW.amount IS NOT NULL AND NEW.received_at IS NOT NULL THEN
        PERFORM ledger_day_add(NEW.workshop_id, NEW.received_at, CASE WHEN NEW.method <> 'card' THEN 'offline' ELSE NEW.kind END, NEW.state,
          NEW.amount, COALESCE(NEW.fee, 0),
          CASE WHEN NEW.method <> 'card' THEN COALESCE(NEW.net, NEW.amount) ELSE COALESCE(NEW.net, 0) END, 1);
      END IF;
      RETURN NULL;
    END $$`);
  await q(`CREATE TRIGGER payments_ledger_day_totals AFTER INSERT OR UPDATE OR DELETE ON payments FOR EACH ROW EXECUTE FUNCTION payments_ledger_day_totals()`);

  await q(`
    CREATE FUNCTION refunds_ledger_day_totals() RETURNS trigger
    LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP IN ('UPDATE', 'DELETE') AND OLD.state <> 'failed' THEN
        IF TG_OP = 'UPDATE' AND NEW.state = OLD.state AND NEW.amount = OLD.amount AND NEW.created_at = OLD.created_at AND NEW.workshop_id = OLD.workshop_id THEN
          RETURN NULL;
        END IF;
        PERFORM ledger_day_add(OLD.workshop_id, OLD.created_at, 'refund', OLD.state, -OLD.amount, 0, -OLD.amount, -1);
      END IF;
      IF TG_OP IN ('INSERT', 'UPDATE') AND NEW.state <> 'failed' THEN
        PERFORM ledger_day_add(NEW.workshop_id, NEW.created_at, 'refund', NEW.state, -NEW.amount, 0, -NEW.amount, 1);
      END IF;
      RETURN NULL;
    END $$`);
  await q(`CREATE TRIGGER refunds_ledger_day_totals AFTER INSERT OR UPDATE OR DELETE ON refunds FOR EACH ROW EXECUTE FUNCTION refunds_ledger_day_totals()`);

  // Rebuilds one workshop's day totals from its rows: for the rows already there, and for a bulk
  // load that ran with the triggers off (the scale seed).
  await q(`
    CREATE FUNCTION ledger_day_totals_rebuild(w uuid) RETURNS void
    LANGUAGE sql AS $$
      DELETE FROM ledger_day_totals WHERE workshop_id = w;
      INSERT INTO ledger_day_totals (workshop_id, day, kind, status, rows, gross, fee, net)
      SELECT w, (at AT TIME ZONE 'UTC')::date, kind, status, count(*), SUM(gross), SUM(fee), SUM(net)
        FROM (SELECT received_at AS at, CASE WHEN method <> 'card' THEN 'offline' ELSE kind END AS kind, state AS status, amount AS gross,
                     COALESCE(fee, 0) AS fee, CASE WHEN method <> 'card' THEN COALESCE(net, amount) ELSE COALESCE(net, 0) END AS net
                FROM payments WHERE workshop_id = w AND amount IS NOT NULL AND received_at IS NOT NULL
              UNION ALL
              SELECT created_at, 'refund', state, -amount, 0, -amount FROM refunds WHERE workshop_id = w AND state <> 'failed') l
       GROUP BY 2, 3, 4
    $$`);
  await q(`SELECT ledger_day_totals_rebuild(id) FROM workshops`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`DROP TRIGGER IF EXISTS payments_ledger_day_totals ON payments`);
  await q(`DROP TRIGGER IF EXISTS refunds_ledger_day_totals ON refunds`);
  await q(`DROP FUNCTION IF EXISTS payments_ledger_day_totals()`);
  await q(`DROP FUNCTION IF EXISTS refunds_ledger_day_totals()`);
  await q(`DROP FUNCTION IF EXISTS ledger_day_totals_rebuild(uuid)`);
  await q(`DROP FUNCTION IF EXISTS ledger_day_add(uuid, timestamptz, text, text, numeric, numeric, numeric, integer)`);
  await q(`DROP TABLE IF EXISTS ledger_day_totals`);
  for (const [name] of INDEXES) await q(`DROP INDEX IF EXISTS ${name}`);
}
