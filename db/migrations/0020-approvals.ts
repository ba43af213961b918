import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

// Allowed values are written out, never imported from the code: this migration must create the
// same schema forever, whatever the code's lists say later (a later change is a new migration).

/*
 * A request belongs to one job; its findings and decisions reference (job_id, request id) and
 * (job_id, finding id), so the database itself refuses a finding of another job in a request.
 * Only the SHA-256 of a link token is stored: a leaked database alone does not hand out live links.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    ALTER TABLE jobs
      ADD COLUMN pre_auth_per_finding numeric(14,2) CHECK (pre_auth_per_finding >= 0),
      ADD COLUMN pre_auth_per_job numeric(14,2) CHECK (pre_auth_per_job >= 0),
      ADD COLUMN pre_auth_agreed_how text NOT NULL DEFAULT ''`);
  await q(`
    CREATE TABLE approval_requests (
      id uuid PRIMARY KEY DEFAULT gen_random_uuid(),
      workshop_id uuid NOT NULL,
      job_id uuid NOT NULL,
      state text NOT NULL DEFAULT 'sent' CHECK (state IN ('sent', 'decided', 'expired', 'revoked', 'replaced')),
      snapshot jsonb NOT NULL,
      snapshot_hash text NOT NULL CHECK (snapshot_hash ~ '^[0-9a-f]{64}$'),
      -- The link token is an HMAC of this nonce under the server's secret, so a reminder can repeat
      -- the same link; the hash finds the request from a link without storing the link itself.
      link_nonce text NOT NULL,
      token_hash text NOT NULL UNIQUE CHECK (token_hash ~ '^[0-9a-f]{64}$'),
      gross numeric(14,2) NOT NULL,
      sent_at timestamptz NOT NULL DEFAULT now(),
      expires_at timestamptz NOT NULL,
      decided_at timestamptz,
      decided_by_name text,
      decided_ip text,
      decided_user_agent text,
      revoked_at timestamptz,
      replaced_by_id uuid REFERENCES approval_requests(id),
      last_reminded_at timestamptz,
      sent_by_user_id uuid REFERENCES users(id) ON DELETE SET NULL,
      version integer NOT NULL DEFAULT 0,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      FOREIGN KEY (workshop_id, job_id) REFERENCES jobs (workshop_id, id) ON DELETE CASCADE,
      UNIQUE (job_id, id),
      CHECK ((state = 'decided') = (decided_at IS NOT NULL)),
      CHECK (state <> 'replaced' OR replaced_by_id IS NOT NULL)
    )`);
  await q(`CREATE INDEX approval_requests_job_idx ON approval_requests (job_id, sent_at DESC)`);
  await q(`CREATE INDEX approval_requests_open_idx ON approval_requests (state, sent_at) WHERE state = 'sent'`);
  await q(`
    CREATE TABLE approval_request_findings (
      job_id uuid NOT NULL,
      request_id uuid NOT NULL,
      finding_id uuid NOT NULL,
      position integer NOT NULL,
      PRIMARY KEY (request_id, finding_id),
      FOREIGN KEY (job_id, request_id) REFERENCES approval_requests (job_id, id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, finding_id) REFERENCES findings (job_id, id) ON DELETE CASCADE
    )`);
  await q(`
    CREATE TABLE approval_decisions (
      job_id uuid NOT NULL,
      request_id uuid NOT NULL,
      finding_id uuid NOT NULL,
      decision text NOT NULL CHECK (decision IN ('approve', 'decline')),
      note text NOT NULL DEFAULT '',
      created_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (request_id, finding_id),
      FOREIGN KEY (request_id, finding_id) REFERENCES approval_request_findings (request_id, finding_id) ON DELETE CASCADE,
      FOREIGN KEY (job_id, request_id) REFERENCES approval_requests (job_id, id) ON DELETE CASCADE
    )`);
  // Findings approved on the owner's behalf: which request run did it and for how much (incl. VAT).
  await q(`ALTER TABLE findings ADD COLUMN within_limit_gross numeric(14,2)`);
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`ALTER TABLE findings DROP COLUMN IF EXISTS within_limit_gross`);
  for (const t of ['approval_decisions', 'approval_request_findings', 'approval_requests']) await q(`DROP TABLE IF EXISTS ${t} CASCADE`);
  await q(`ALTER TABLE jobs DROP COLUMN IF EXISTS pre_auth_per_finding, DROP COLUMN IF EXISTS pre_auth_per_job, DROP COLUMN IF EXISTS pre_auth_agreed_how`);
}
