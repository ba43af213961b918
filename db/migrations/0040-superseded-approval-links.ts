import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * Links a request had before it was re-sent. Re-sending issues a new link and the old one stops
 * deciding anything, but the owner may still open an older e-mail: keeping the SHA-256 of each
 * superseded token (never the token) lets the page say a newer link was sent, instead of treating
 * the link as one the workshop never issued.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  await q(`
    CREATE TABLE approval_superseded_links (
      token_hash text PRIMARY KEY CHECK (token_hash ~ '^[0-9a-f]{64}$'),
      request_id uuid NOT NULL REFERENCES approval_requests(id) ON DELETE CASCADE,
      -- When the newer link that superseded this one was sent.
      superseded_at timestamptz NOT NULL DEFAULT now()
    )`);
  await q(`CREATE INDEX approval_superseded_links_request_idx ON approval_superseded_links (request_id, superseded_at DESC)`);
}

export async function down({ context }: Ctx): Promise<void> {
  await context.sequelize.query(`DROP TABLE IF EXISTS approval_superseded_links CASCADE`);
}
