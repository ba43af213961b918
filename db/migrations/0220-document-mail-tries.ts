import type { QueryInterface } from 'sequelize';

type Ctx = { context: QueryInterface };

/*
 * How many times the owner's e-mail of an invoice or credit note was tried, and when the tries were
 * given up: a document whose PDF never renders is no longer retried every ten minutes for ever. Staff
 * see it on the document ("Not e-mailed") and send it again, which clears both.
 */
export async function up({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  for (const table of ['invoices', 'credit_notes']) {
    await q(`ALTER TABLE ${table} ADD COLUMN mail_tries integer NOT NULL DEFAULT 0 CHECK (mail_tries >= 0)`);
    await q(`ALTER TABLE ${table} ADD COLUMN mail_given_up_at timestamptz`);
    await q(`ALTER TABLE ${table} ADD CONSTRAINT ${table}_mail_given_up_unmailed CHECK (mail_given_up_at IS NULL OR mailed_at IS NULL)`);
  }
}

export async function down({ context }: Ctx): Promise<void> {
  const q = (sql: string) => context.sequelize.query(sql);
  for (const table of ['credit_notes', 'invoices']) {
    await q(`ALTER TABLE ${table} DROP CONSTRAINT ${table}_mail_given_up_unmailed`);
    await q(`ALTER TABLE ${table} DROP COLUMN mail_given_up_at`);
    await q(`ALTER TABLE ${table} DROP COLUMN mail_tries`);
  }
}
