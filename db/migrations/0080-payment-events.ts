import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Every card-processor event the webhook accepted, once. The processor delivers at least once (and
 * retries, and may repeat itself), so the event id is UNIQUE and the row is written in the same
 * transaction as whatever the event changes: a second delivery finds the row and writes nothing.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    CREATE TABLE payment_events (
      id uuid PRIMARY KEY,
      stripe_event_id text NOT NULL CHECK (stripe_event_id ~ '^evt_[A-Za-z0-9_]{1,250}$'),
      type text NOT NULL CHECK (length(type) BETWEEN 1 AND 200),
      livemode boolean NOT NULL,
      api_version text,
      -- The id of the object the event is about (data.object.id): a session, payment intent, charge …
      object_id text,
      -- Filled when a handler matches the event to one workshop's record.
      workshop_id uuid REFERENCES workshops(id) ON DELETE SET NULL,
      -- processed: a handler acted on it; recorded: a type Wingstage will act on, kept for it;
      -- ignored: a type Wingstage does not use, acknowledged so the processor stops sending it.
      outcome text NOT NULL CHECK (outcome IN ('processed', 'recorded', 'ignored')),
      stripe_created_at timestamptz NOT NULL,
      received_at timestamptz NOT NULL DEFAULT now(),
      payload jsonb NOT NULL,
      CONSTRAINT payment_events_stripe_event_id_key UNIQUE (stripe_event_id)
    )`);
  await q(`CREATE INDEX payment_events_object_idx ON payment_events (object_id)`);
  await q(`CREATE INDEX payment_events_workshop_idx ON payment_events (workshop_id, received_at DESC)`);
}

export async function down({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`DROP TABLE IF EXISTS payment_events CASCADE`);
}
