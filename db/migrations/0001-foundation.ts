import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

// Allowed values are written out, never imported from the code: this migration must create the
// same schema forever, whatever the code's lists say later (a later change is a new migration).

export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    CREATE TABLE workshops (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      name text NOT NULL,
      address_lines text NOT NULL DEFAULT '',
      postcode text NOT NULL DEFAULT '',
      vat_number text NOT NULL DEFAULT '',
      currency char(3) NOT NULL DEFAULT 'GBP',
      vat_rates jsonb NOT NULL,
      labour_rates jsonb NOT NULL DEFAULT '[]'::jsonb,
      settings jsonb NOT NULL DEFAULT '{}'::jsonb,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`
    CREATE TABLE customers (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      name text NOT NULL,
      kind text NOT NULL DEFAULT 'private' CHECK (kind IN ('private', 'group')),
      email text NOT NULL,
      phone text NOT NULL DEFAULT '',
      address_lines text NOT NULL DEFAULT '',
      postcode text NOT NULL DEFAULT '',
      notes text NOT NULL DEFAULT '',
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (workshop_id, id)
    )`);
  await q(`CREATE INDEX customers_workshop_name_idx ON customers (workshop_id, lower(name))`);
  await q(`
    CREATE TABLE users (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      email text NOT NULL CONSTRAINT users_email_key UNIQUE,
      name text NOT NULL,
      role text NOT NULL CHECK (role IN ('admin', 'manager', 'engineer', 'accounts', 'owner')),
      password_hash text,
      customer_id uuid,
      active boolean NOT NULL DEFAULT true,
      session_epoch integer NOT NULL DEFAULT 0,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      -- An owner's customer must be in the owner's own workshop.
      FOREIGN KEY (workshop_id, customer_id) REFERENCES customers (workshop_id, id) ON DELETE CASCADE,
      CHECK ((role = 'owner') = (customer_id IS NOT NULL)),
      CHECK (email = lower(email))
    )`);
  await q(`CREATE INDEX users_workshop_idx ON users (workshop_id)`);
  await q(`
    CREATE TABLE aircraft (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      customer_id uuid NOT NULL,
      registration text NOT NULL,
      type text NOT NULL,
      serial text NOT NULL DEFAULT '',
      airframe_hours numeric(12,1) NOT NULL DEFAULT 0 CHECK (airframe_hours >= 0),
      engine text NOT NULL DEFAULT '',
      engine_hours numeric(12,1) NOT NULL DEFAULT 0 CHECK (engine_hours >= 0),
      notes text NOT NULL DEFAULT '',
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, customer_id) REFERENCES customers (workshop_id, id),
      CONSTRAINT aircraft_workshop_registration_key UNIQUE (workshop_id, registration),
      UNIQUE (workshop_id, id)
    )`);
  await q(`CREATE INDEX aircraft_customer_idx ON aircraft (customer_id)`);
  await q(`
    CREATE TABLE job_counters (
      workshop_id uuid PRIMARY KEY REFERENCES workshops(id) ON DELETE CASCADE,
      last_number integer NOT NULL DEFAULT 0
    )`);
  await q(`
    CREATE TABLE jobs (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      number text NOT NULL,
      aircraft_id uuid NOT NULL,
      title text NOT NULL,
      type text NOT NULL CHECK (type IN ('annual_permit_inspection', 'engine_service_100h', 'engine_service_200h', 'wing_strip_recover', 'gearbox_inspection', 'repair', 'other')),
      state text NOT NULL DEFAULT 'booked_in' CHECK (state IN ('booked_in', 'inspecting', 'awaiting_owner', 'in_work', 'ready_for_release', 'invoiced', 'paid', 'closed', 'cancelled')),
      booked_in_on date NOT NULL,
      due_on date,
      notes text NOT NULL DEFAULT '',
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, aircraft_id) REFERENCES aircraft (workshop_id, id),
      UNIQUE (workshop_id, number),
      CHECK (due_on IS NULL OR due_on >= booked_in_on)
    )`);
  await q(`CREATE INDEX jobs_aircraft_idx ON jobs (aircraft_id)`);
  await q(`CREATE INDEX jobs_workshop_state_idx ON jobs (workshop_id, state)`);
  await q(`
    CREATE TABLE audit_events (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL REFERENCES workshops(id) ON DELETE CASCADE,
      job_id uuid REFERENCES jobs(id) ON DELETE CASCADE,
      actor_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      action text NOT NULL,
      summary text NOT NULL,
      detail jsonb NOT NULL DEFAULT '{}'::jsonb,
      at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX audit_events_job_idx ON audit_events (job_id, at)`);
  await q(`CREATE INDEX audit_events_workshop_idx ON audit_events (workshop_id, at)`);
  await q(`
    CREATE TABLE one_time_tokens (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      purpose text NOT NULL CHECK (purpose IN ('invite', 'reset')),
      token_hash char(64) NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX one_time_tokens_user_idx ON one_time_tokens (user_id, purpose)`);
  await q(`
    CREATE TABLE sign_in_failures (
      id bigserial PRIMARY KEY,
      email text NOT NULL,
      address text NOT NULL DEFAULT '',
      at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX sign_in_failures_email_at_idx ON sign_in_failures (email, at)`);
  await q(`
    CREATE TABLE revoked_sessions (
      sid uuid PRIMARY KEY,
      user_id uuid NOT NULL REFERENCES users(id) ON DELETE CASCADE,
      expires_at timestamptz NOT NULL
    )`);
}

export async function down({ context }: Ctx): Promise<void> {
  for (const table of ['revoked_sessions', 'sign_in_failures', 'one_time_tokens', 'audit_events', 'jobs', 'job_counters', 'aircraft', 'users', 'customers', 'workshops']) {
    await context.sequelize.query(`DROP TABLE IF EXISTS ${table} CASCADE`);
  }
}
